import "server-only";
import type PgBoss from "pg-boss";
import { z } from "zod";
import { deliverDueMail, OUTBOX_POLICY } from "@/lib/mail/actions";
import { hasDueMail } from "@/lib/mail/queries";
import { readInstitutionSettings } from "@/lib/settings/queries";
import type { SmtpSettings } from "@/lib/mail/transport";
import { runReminders } from "./actions";
import { createBoss, ensureQueues, QUEUES } from "./boss";
import { systemClock, type Clock } from "./clock";

// The job worker: pg-boss handlers for the outbox and the daily permit job. It runs inside the web
// server (instrumentation.ts, WORKER_IN_APP=true, the default for `npm start`) or as its own process
// (`npm run worker`, for deployments with several app servers). Any number may run at once.
//
//   outbox-flush   every POLL_MS the worker checks for due outbox rows (a cheap indexed query) and,
//                  when there are some, asks pg-boss for a flush; the flush sends them.
//   reminders-run  cron "0 6 * * *" in the institution's time zone (pg-boss keeps the schedule in
//                  the database, so one of the workers runs it); and once whenever a worker starts,
//                  so a day the workers were down is caught up. Repeats are harmless: see
//                  lib/jobs/actions.ts.

export const REMINDER_CRON = "0 6 * * *";
const POLL_MS = 2_000;

const reminderJobData = z.object({ at: z.iso.datetime({ offset: true }).optional() }).catch({});

export type WorkerOptions = {
  clock?: Clock;
  /** SMTP settings per flush (tests switch the server mid-run); default: from the environment. */
  smtp?: () => SmtpSettings;
  pollMs?: number;
  /** Back-off for failed sends (tests shorten it); default OUTBOX_POLICY.backoff. */
  backoff?: { baseSeconds: number; capSeconds: number };
  /** Register the daily schedule and run the permit job once at start (default true). */
  schedule?: boolean;
  connectionString?: string;
  log?: (line: string) => void;
  /**
   * Which outbox rows a flush may send (default: every due row). Tests that share an outbox with
   * other test files name their own rows, so a flush does not first work through everyone else's.
   */
  outboxIds?: () => Promise<number[]>;
};

export type RunningWorker = {
  boss: PgBoss;
  /** Asks for a flush now (returns when the job is queued, not when mail is sent). */
  requestFlush(): Promise<void>;
  /** Queues a run of the permit job, optionally as if it were `at`. */
  requestReminders(at?: Date): Promise<void>;
  stop(): Promise<void>;
};

function validTimeZone(timeZone: string): string {
  try {
    new Intl.DateTimeFormat("en", { timeZone });
    return timeZone;
  } catch {
    return "UTC";
  }
}

export async function startWorker(options: WorkerOptions = {}): Promise<RunningWorker> {
  const clock = options.clock ?? systemClock;
  const log = options.log ?? ((line: string) => console.log(line));
  const backoff = options.backoff ?? OUTBOX_POLICY.backoff;
  const boss = createBoss({ connectionString: options.connectionString });
  boss.on("error", (error) => console.error("[worker] pg-boss:", error.message));
  await boss.start();
  await ensureQueues(boss);

  await boss.work(QUEUES.outbox, { pollingIntervalSeconds: 1, batchSize: 1 }, async () => {
    const ids = options.outboxIds ? await options.outboxIds() : undefined;
    const report = await deliverDueMail({ now: clock(), smtp: options.smtp?.(), backoff, ids });
    const total = report.sent.length + report.retry.length + report.failed.length + report.unknown.length;
    if (total > 0) {
      log(
        `[worker] outbox: ${report.sent.length} sent, ${report.retry.length} to retry, ${report.failed.length} failed` +
          (report.unknown.length ? `, ${report.unknown.length} unconfirmed` : ""),
      );
    }
    return report;
  });

  await boss.work(QUEUES.reminders, { pollingIntervalSeconds: 2, batchSize: 1 }, async ([job]) => {
    const { at } = reminderJobData.parse(job?.data ?? {});
    const report = await runReminders({ now: at ? new Date(at) : clock() });
    log(
      `[worker] permits on ${report.today} (${report.timeZone}): ${report.expired.length} expired, ${report.queued.length} reminder(s) queued, ${report.inspections.length} inspection(s) due, ${report.training.length} course(s) lapsing`,
    );
    if (report.queued.length + report.inspections.length + report.training.length > 0)
      await boss.send(QUEUES.outbox, {});
    return { today: report.today, expired: report.expired.length, queued: report.queued.length };
  });

  if (options.schedule !== false) {
    const { timeZone } = await readInstitutionSettings();
    await boss.schedule(QUEUES.reminders, REMINDER_CRON, {}, { tz: validTimeZone(timeZone) });
    await boss.send(QUEUES.reminders, {});
  }

  let polling = false;
  const poll = async () => {
    if (polling) return;
    polling = true;
    try {
      if (await hasDueMail(clock(), backoff)) await boss.send(QUEUES.outbox, {});
    } catch (error) {
      console.error("[worker] outbox check failed:", error instanceof Error ? error.message : error);
    } finally {
      polling = false;
    }
  };
  const timer = setInterval(poll, options.pollMs ?? POLL_MS);
  timer.unref?.();
  void poll();

  return {
    boss,
    async requestFlush() {
      await boss.send(QUEUES.outbox, {});
    },
    async requestReminders(at?: Date) {
      await boss.send(QUEUES.reminders, at ? { at: at.toISOString() } : {});
    },
    async stop() {
      clearInterval(timer);
      await boss.stop({ graceful: true, timeout: 10_000, wait: true });
    },
  };
}

const globalForWorker = globalThis as unknown as { benchclearWorker?: Promise<RunningWorker> };

/** Starts the worker once per process (Next.js may call instrumentation more than once in dev). */
export function startWorkerOnce(options: WorkerOptions = {}): Promise<RunningWorker> {
  globalForWorker.benchclearWorker ??= startWorker(options).catch((error) => {
    globalForWorker.benchclearWorker = undefined;
    throw error;
  });
  return globalForWorker.benchclearWorker;
}
