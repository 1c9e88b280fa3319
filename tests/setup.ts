// Runs before every test file. scripts/test.mjs sets DATABASE_URL to the fresh test database and
// TEST_BASE_URL to the production build it started; tests that need them say so when they are missing.
import { afterAll } from "vitest";

afterAll(async () => {
  // What shared helpers registered for this file (tests/support/file-cleanup.ts), while the pools
  // are still open.
  const { runFileCleanups } = await import("./support/file-cleanup");
  await runFileCleanups();
  // Close the pool a test file opened, so vitest can end the worker cleanly.
  const { closeDb } = await import("@/db");
  await closeDb();
  const { closeOwnerDb } = await import("./support/db");
  await closeOwnerDb();
});
