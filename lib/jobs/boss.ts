import "server-only";
import PgBoss from "pg-boss";
import { env } from "@/lib/env";

// The pg-boss instance: a job queue in the same PostgreSQL, in its own schema ("pgboss"), created and
// migrated by pg-boss on first start. Queues, and why each has its policy:
//   outbox-flush   sends due outbox rows. Policy "short": at most one waiting job, however many
//                  workers ask for a flush, so a busy outbox does not pile up jobs; several may run
//                  at once, which is safe (rows are claimed with FOR UPDATE SKIP LOCKED).
//   reminders-run  the daily permit job. Policy "short" too; running twice is harmless (unique
//                  reminder keys), one waiting run is enough.
// A job that throws is retried by pg-boss with exponential back-off (retryBackoff).

export const QUEUES = {
  outbox: "outbox-flush",
  reminders: "reminders-run",
} as const;

export const BOSS_SCHEMA = "pgboss";

export function createBoss(options: { connectionString?: string; max?: number } = {}): PgBoss {
  return new PgBoss({
    connectionString: options.connectionString ?? env().DATABASE_URL,
    schema: BOSS_SCHEMA,
    max: options.max ?? 4,
    application_name: "benchclear-worker",
    // Completed jobs are bookkeeping only; keep a week of them for diagnosis.
    deleteAfterDays: 7,
  });
}

export async function ensureQueues(boss: PgBoss): Promise<void> {
  await boss.createQueue(QUEUES.outbox, {
    name: QUEUES.outbox,
    policy: "short",
    retryLimit: 5,
    retryDelay: 5,
    retryBackoff: true,
    expireInSeconds: 15 * 60,
  });
  await boss.createQueue(QUEUES.reminders, {
    name: QUEUES.reminders,
    policy: "short",
    retryLimit: 8,
    retryDelay: 60,
    retryBackoff: true,
    expireInSeconds: 30 * 60,
  });
}
