// Types for next-server.mjs (plain JavaScript shared with the start and test scripts).
export const PEER_PRELOAD: string;
export function nextCommand(args: string[]): [string, string[]];
