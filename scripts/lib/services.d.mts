// Types for the parts of services.mjs that TypeScript code (tests, backup scripts) uses.
export function pgStopFast(): number;
export function pgStartAgain(env?: Record<string, string | undefined>): number;
export function pgPaths(): { bin: string | null; dir: string; log: string };
export function isRoot(): boolean;
export const PG_PORT: number;
export const root: string;
