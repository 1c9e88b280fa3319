// Work a shared test helper must undo when the current test file ends. Vitest runs a copy's files
// one after another in one process without isolation (vitest.config.ts), so a helper module is
// evaluated once for all of them: a hook it registered at its top level would run for the first
// file only. Helpers register here instead; tests/setup.ts, which runs for every file, runs and
// forgets the list when each file ends.
type Cleanup = () => Promise<void> | void;

const key = Symbol.for("benchclear.fileCleanups");
const registry = globalThis as unknown as { [key]?: Cleanup[] };

/** Runs `cleanup` once, when the test file that is running now ends. */
export function onFileEnd(cleanup: Cleanup): void {
  (registry[key] ??= []).push(cleanup);
}

/** Runs every registered cleanup (last registered first) and empties the list. */
export async function runFileCleanups(): Promise<void> {
  const cleanups = registry[key] ?? [];
  registry[key] = [];
  for (const cleanup of cleanups.reverse()) await cleanup();
}
