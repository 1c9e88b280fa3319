import { defineConfig } from "drizzle-kit";

// drizzle-kit generates SQL migrations from db/schema into db/migrations (committed). Migrations are
// applied by scripts/lib/migrate.ts, never inside `next build`.
export default defineConfig({
  dialect: "postgresql",
  schema: "./db/schema/index.ts",
  out: "./db/migrations",
  dbCredentials: {
    url: process.env.DATABASE_URL ?? "postgres://benchclear@127.0.0.1:54329/benchclear",
  },
  casing: "snake_case",
  strict: true,
  verbose: true,
});
