import path from "node:path";
import { defineConfig } from "vitest/config";

// Tests run against the real PostgreSQL that scripts/test.mjs starts; DATABASE_URL points at the
// separate test database. Files run one at a time because they share that database.
export default defineConfig({
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
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
