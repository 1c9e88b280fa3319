// Applies the committed SQL migrations in db/migrations, as the owner role (DATABASE_OWNER_URL, or
// DATABASE_URL when there is no separate owner). Run through scripts/migrate.ts by `npm start`,
// `npm test`, `npm run cluster` and `npm run db:migrate` as a step of its own; never by `next build`
// and never by an app server on start. After the SQL it does what SQL alone cannot:
//   * seals decisions made before the seal existed with DECISION_HMAC_KEY (the key is not in the
//     database), then makes the seal NOT NULL, so no unsealed decision can be added afterwards;
//   * installs pg-boss's schema and queues as the owner and gives the app's role the use of them
//     (the app's role has no CREATE on the database).
//
// Two deploys may migrate at the same moment: each takes a session-level advisory lock on its own
// connection first, so the second waits for the first and then finds nothing left to apply (the
// migrator skips what its journal table already records, the sealing finds the column NOT NULL).
import path from "node:path";
import { isNull, sql } from "drizzle-orm";
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import pg from "pg";
import { env } from "@/lib/env";
import { decisionHmac } from "@/lib/records/seal";
import * as schema from "./schema";

export const APP_ROLE = "benchclear_app";

// An arbitrary 64-bit key that names "Benchclear migrations" among advisory locks in this database.
export const MIGRATION_LOCK_KEY = "7263514009118221";

export async function runMigrations(
  options: { connectionString?: string; log?: (line: string) => void } = {},
): Promise<void> {
  const log = options.log ?? (() => {});
  const config = env();
  const url = options.connectionString ?? config.DATABASE_OWNER_URL ?? config.DATABASE_URL;
  const client = new pg.Client({ connectionString: url, application_name: "benchclear-migrate" });
  await client.connect();
  try {
    await client.query("SELECT pg_advisory_lock($1::bigint)", [MIGRATION_LOCK_KEY]);
    const db = drizzle({ client, schema, casing: "snake_case" });
    await migrate(db, { migrationsFolder: path.join(import.meta.dirname, "migrations") });
    await sealOlderDecisions(db, log);
    await installJobQueue(url, client, log);
  } finally {
    // The lock goes with the session in any case; unlocking first lets a waiting deploy go on at once.
    await client.query("SELECT pg_advisory_unlock($1::bigint)", [MIGRATION_LOCK_KEY]).catch(() => undefined);
    await client.end();
  }
}

async function sealOlderDecisions(db: ReturnType<typeof drizzle<typeof schema>>, log: (line: string) => void) {
  const nullable = await db.execute<{ is_nullable: string }>(
    sql`SELECT is_nullable FROM information_schema.columns
        WHERE table_schema = 'public' AND table_name = 'decision' AND column_name = 'hmac'`,
  );
  if (nullable.rows[0]?.is_nullable !== "YES") return;
  await db.transaction(async (tx) => {
    const rows = await tx.select().from(schema.decisions).where(isNull(schema.decisions.hmac));
    for (const row of rows) {
      await tx.execute(sql`UPDATE decision SET hmac = ${decisionHmac(row)} WHERE id = ${row.id} AND hmac IS NULL`);
    }
    await tx.execute(sql`ALTER TABLE decision ALTER COLUMN hmac SET NOT NULL`);
    log(`  sealed ${rows.length} decision(s) made before the seal existed`);
  });
}

async function installJobQueue(url: string, client: pg.Client, log: (line: string) => void) {
  // lib/jobs/boss.ts is server-only; load it the way the worker script does.
  await import("@/lib/jobs/standalone");
  const { BOSS_SCHEMA, createBoss, ensureQueues } = await import("@/lib/jobs/boss");
  const boss = createBoss({ connectionString: url, max: 2 });
  boss.on("error", (error) => log(`  pg-boss: ${error.message}`));
  await boss.start();
  try {
    await ensureQueues(boss);
  } finally {
    await boss.stop({ graceful: false, wait: true });
  }
  const role = await client.query("SELECT 1 FROM pg_roles WHERE rolname = $1", [APP_ROLE]);
  if (role.rowCount === 0) return;
  // Job bookkeeping, not records: the app's role may read and change every row of it.
  await client.query(`GRANT USAGE ON SCHEMA ${BOSS_SCHEMA} TO ${APP_ROLE}`);
  await client.query(`GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA ${BOSS_SCHEMA} TO ${APP_ROLE}`);
  await client.query(`GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA ${BOSS_SCHEMA} TO ${APP_ROLE}`);
  await client.query(`GRANT EXECUTE ON ALL FUNCTIONS IN SCHEMA ${BOSS_SCHEMA} TO ${APP_ROLE}`);
}
