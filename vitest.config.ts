import path from "node:path";
import { defineConfig } from "vitest/config";

// Tests run against the real PostgreSQL that scripts/test.mjs starts; DATABASE_URL points at the
// separate test database. Files run one at a time, in one process, because they share that database; a full run starts
// several copies of the set-up, each with its own database, and splits the files over them.
export default defineConfig({
  // `npm test` runs several vitest processes at once (scripts/test.mjs); each keeps its own cache of
  // file durations, so none reads a file another is writing.
  cacheDir: path.join("node_modules/.vite", process.env.TEST_DB_NAME ?? "benchclear_test"),
  resolve: {
    alias: {
      "@": path.resolve(import.meta.dirname),
      // `server-only` throws outside a React Server Components bundle; tests are server code.
      "server-only": path.resolve(import.meta.dirname, "tests/support/empty.ts"),
    },
  },
  test: {
    include: ["tests/**/*.test.ts", "tests/**/*.test.tsx"],
    exclude: ["node_modules/**"],
    environment: "node",
    // next-auth imports "next/server" without an extension; let vite resolve it.
    server: { deps: { inline: ["next-auth", "@auth/core"] } },
    setupFiles: ["tests/setup.ts"],
    fileParallelism: false,
    // One process runs a copy's files one after another and keeps the modules it loaded: each file
    // re-importing the app's libraries (the database client, Auth.js, the hazard engine, the PDF
    // renderer) cost about 3 s of a 2-core machine per file. Files must therefore leave no state
    // behind in modules: helpers undo their work through tests/support/file-cleanup.ts.
    isolate: false,
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
