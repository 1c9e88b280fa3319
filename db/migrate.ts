// Applies the committed SQL migrations in db/migrations. Run through scripts/migrate.ts by `npm start`,
// `npm test`, `npm run cluster` and `npm run db:migrate` as a step of its own; never by `next build`
// and never by an app server on start.
//
// Two deploys may migrate at the same moment: each takes a session-level advisory lock on its own
// connection first, so the second waits for the first and then finds nothing left to apply (the
// migrator skips what its journal table already records).
import path from "node:path";
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import pg from "pg";
import { env } from "@/lib/env";

// An arbitrary 64-bit key that names "Benchclear migrations" among advisory locks in this database.
export const MIGRATION_LOCK_KEY = "7263514009118221";

export async function runMigrations(connectionString = env().DATABASE_URL): Promise<void> {
  const client = new pg.Client({ connectionString, application_name: "benchclear-migrate" });
  await client.connect();
  try {
    await client.query("SELECT pg_advisory_lock($1::bigint)", [MIGRATION_LOCK_KEY]);
    await migrate(drizzle({ client }), { migrationsFolder: path.join(import.meta.dirname, "migrations") });
  } finally {
    // The lock goes with the session in any case; unlocking first lets a waiting deploy go on at once.
    await client.query("SELECT pg_advisory_unlock($1::bigint)", [MIGRATION_LOCK_KEY]).catch(() => undefined);
    await client.end();
  }
}
