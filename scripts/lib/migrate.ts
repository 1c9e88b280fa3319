// Applies the committed SQL migrations in db/migrations (it lives in scripts/ because it uses lib/:
// the decision seal and the job queue; db/ sits below lib/), as the owner role (DATABASE_OWNER_URL, or
// DATABASE_URL when there is no separate owner). Run through scripts/migrate.ts by `npm start`,
// `npm test`, `npm run cluster` and `npm run db:migrate` as a step of its own; never by `next build`
// and never by an app server on start. After the SQL it does what SQL alone cannot:
//   * seals decisions that have none yet (made before the seal existed, or bulk-loaded) with DECISION_HMAC_KEY (the key is not in the
//     database), then makes the seal NOT NULL, so no unsealed decision can be added afterwards;
//   * installs pg-boss's schema and queues as the owner and gives the app's role the use of them
//     (the app's role has no CREATE on the database).
//
// Two deploys may migrate at the same moment: each takes a session-level advisory lock on its own
// connection first, so the second waits for the first and then finds nothing left to apply (the
// migrator skips what its journal table already records, the sealing finds the column NOT NULL).
import path from "node:path";
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import pg from "pg";
import { env } from "@/lib/env";
import { decisionHmac, type SealableDecision } from "@/lib/records/seal";
import * as schema from "@/db/schema";

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
    await migrate(db, { migrationsFolder: path.join(import.meta.dirname, "..", "..", "db", "migrations") });
    await sealOlderDecisions(client, log);
    await installJobQueue(url, client, log);
  } finally {
    // The lock goes with the session in any case; unlocking first lets a waiting deploy go on at once.
    await client.query("SELECT pg_advisory_unlock($1::bigint)", [MIGRATION_LOCK_KEY]).catch(() => undefined);
    await client.end();
  }
}

type UnsealedRow = {
  id: string;
  application_id: string;
  revision_id: string;
  kind: SealableDecision["kind"];
  step: number | null;
  signer_id: string;
  signer_name: string;
  signer_role: string;
  meaning: string;
  content_hash: string;
  conditions: string[] | null;
  valid_from: string | null;
  valid_to: string | null;
  validity_reason: string | null;
  signed_at: Date;
};

/**
 * Seals decisions that have no seal yet (rows from before migration 0008, or bulk-loaded benchmark
 * data), then makes the column NOT NULL. Only runs while the column still allows NULL: once it is
 * NOT NULL no unsealed row can exist, so a forged row added later is never sealed here.
 */
export async function sealOlderDecisions(
  db: pg.Client | pg.Pool,
  log: (line: string) => void = () => {},
): Promise<number> {
  const nullable = await db.query<{ is_nullable: string }>(
    `SELECT is_nullable FROM information_schema.columns
      WHERE table_schema = 'public' AND table_name = 'decision' AND column_name = 'hmac'`,
  );
  if (nullable.rows[0]?.is_nullable !== "YES") return 0;
  const key = env().DECISION_HMAC_KEY;
  const client = db instanceof pg.Pool ? await db.connect() : db;
  let sealed = 0;
  try {
    await client.query("BEGIN");
    // An approval's validity is that of the permit it issued.
    await client.query(`UPDATE decision d SET valid_from = p.valid_from, valid_to = p.valid_to,
                                              validity_reason = p.validity_reason
                          FROM permit p
                         WHERE d.hmac IS NULL AND d.kind = 'approve' AND d.valid_from IS NULL
                           AND p.revision_id = d.revision_id`);
    for (;;) {
      const batch = await client.query<UnsealedRow>(
        `SELECT id, application_id, revision_id, kind, step, signer_id, signer_name, signer_role, meaning,
                content_hash, conditions, valid_from::text, valid_to::text, validity_reason, signed_at
           FROM decision WHERE hmac IS NULL LIMIT 5000`,
      );
      if (batch.rows.length === 0) break;
      const hmacs = batch.rows.map((r) =>
        decisionHmac(
          {
            id: r.id,
            applicationId: r.application_id,
            revisionId: r.revision_id,
            kind: r.kind,
            step: r.step,
            signerId: r.signer_id,
            signerName: r.signer_name,
            signerRole: r.signer_role,
            meaning: r.meaning,
            contentHash: r.content_hash,
            conditions: r.conditions,
            validFrom: r.valid_from,
            validTo: r.valid_to,
            validityReason: r.validity_reason,
            signedAt: r.signed_at,
          },
          key,
        ),
      );
      await client.query(
        `UPDATE decision d SET hmac = v.hmac FROM unnest($1::uuid[], $2::text[]) AS v(id, hmac) WHERE d.id = v.id`,
        [batch.rows.map((r) => r.id), hmacs],
      );
      sealed += batch.rows.length;
    }
    await client.query("ALTER TABLE decision ALTER COLUMN hmac SET NOT NULL");
    await client.query("COMMIT");
  } catch (error) {
    await client.query("ROLLBACK").catch(() => undefined);
    throw error;
  } finally {
    if (db instanceof pg.Pool) (client as pg.PoolClient).release();
  }
  log(`  sealed ${sealed} decision(s) made before the seal existed`);
  return sealed;
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
