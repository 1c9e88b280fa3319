// How the scripts start Next.js: node itself, with scripts/lib/peer-address.mjs preloaded so the app
// can tell the TCP peer's address from a header a client sent (lib/http/client-ip.ts), then Next's
// own CLI. The child is node, so its pid is the web server's (tests read its memory use).
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");

export const PEER_PRELOAD = path.join(root, "scripts/lib/peer-address.mjs");

/** [command, args] for `next <args>` with the peer-address preload. */
export function nextCommand(args) {
  return [process.execPath, ["--import", PEER_PRELOAD, path.join(root, "node_modules/next/dist/bin/next"), ...args]];
}
