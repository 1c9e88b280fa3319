import "server-only";
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { mailOutbox, type OutboxMail } from "@/db/schema";
import type { Tx } from "@/lib/audit";
import { composeOutboxMail, UnsendableMailError } from "./compose";
import { dueCondition } from "./queries";
import {
  beginDelivery,
  DeliveryError,
  smtpSettingsFromEnv,
  type PhasedDelivery,
  type SmtpError,
  type SmtpSettings,
} from "./transport";

// Sends queued outbox rows. Run by the pg-boss worker (lib/jobs/worker.ts); safe to run in any
// number of processes at once.
//
// How a row is sent, and why it is sent at most once:
//   BEGIN
//     SELECT … FOR UPDATE SKIP LOCKED    one due row; a row another worker holds is skipped
//     render, connect, MAIL/RCPT/DATA    the server has answered 354 and has the whole message
//                                        except the final "<CRLF>.<CRLF>" (lib/mail/transport.ts)
//     UPDATE status = 'sent'
//   COMMIT
//   write the final dot                  only now can the server accept the message
// A worker that dies before COMMIT leaves the row queued and the server discards the unfinished
// message (the connection drops before the dot), so the retry sends it exactly once. A worker
// that dies after the server accepted finds the row already sent: nothing is sent again. What is
// left is the instant between COMMIT and writing five bytes: a crash exactly there loses that one
// message (the row says sent, the server discarded it). We chose that side on purpose: a reminder
// must never arrive twice, and the window is microseconds wide. If the connection breaks after
// the dot but before the server's reply, the server may or may not have the message; the row stays
// sent and lastError says so. A reply code refusing the message after the dot puts the row back in
// the queue. Every row carries a stable Message-ID, so a message sent twice by any other route
// (an operator re-queuing by hand) is recognisably the same message.
//
// SMTP down: the row stays queued with attempts and lastError, and is tried again after a back-off
// that doubles from 30 s up to 1 h; after MAX_ATTEMPTS (about 13 hours of trying) it is marked
// failed, logged, and listed on /dev/mail. Mail is never dropped silently.

export const OUTBOX_POLICY = {
  // 30 s doubling to a 1 h cap: attempts 1–7 span about 1.06 h, then one an hour, so 80 attempts keep a
  // row waiting for about 74 h. A relay away for a day (or a long weekend's first days) loses nothing.
  maxAttempts: 80,
  backoff: { baseSeconds: 30, capSeconds: 3600 },
  /** A worker stuck mid-send (hung, partitioned) loses its row lock after this long. */
  lockTimeout: "300s",
};

export type DeliveryPhase = "claimed" | "data" | "committed" | "accepted";

/** Called at each phase of a delivery: for logs, and for tests that stop a worker at a phase. */
export type DeliveryObserver = (phase: DeliveryPhase, row: OutboxMail) => void | Promise<void>;

export type DeliverOptions = {
  now?: Date;
  /** Most rows to send in this call (default 100). */
  limit?: number;
  /** Only these outbox rows (resending one message by hand; tests that must not wait for a backlog). */
  ids?: readonly number[];
  smtp?: SmtpSettings;
  observer?: DeliveryObserver;
  maxAttempts?: number;
  backoff?: { baseSeconds: number; capSeconds: number };
};

export type DeliveryOutcome = "sent" | "retry" | "failed" | "unknown";
export type DeliveryReport = Record<DeliveryOutcome, number[]>;

function describe(error: unknown): string {
  if (error instanceof DeliveryError) return describe(error.cause);
  const e = error as SmtpError;
  const parts = [e?.code, e?.responseCode, e?.command].filter((p) => p !== undefined && p !== "");
  const text = e instanceof Error ? e.message : String(error);
  return `${parts.length ? `[${parts.join(" ")}] ` : ""}${text}`.replace(/\s+/g, " ").slice(0, 500);
}

/** A refusal the next attempt cannot fix: a bad stored address, or a 5xx on the recipient. */
function isPermanent(error: unknown): boolean {
  if (error instanceof UnsendableMailError) return true;
  const e = error as SmtpError;
  return typeof e?.responseCode === "number" && e.responseCode >= 500 && /RCPT/i.test(e.command ?? "");
}

async function recordFailure(
  tx: Tx | typeof db,
  row: Pick<OutboxMail, "id" | "attempts">,
  error: unknown,
  now: Date,
  maxAttempts: number,
  whileStatus: "queued" | "sent",
): Promise<DeliveryOutcome> {
  const attempts = row.attempts + 1;
  const failed = isPermanent(error) || attempts >= maxAttempts;
  const lastError = describe(error);
  await tx
    .update(mailOutbox)
    .set({ status: failed ? "failed" : "queued", attempts, lastError, sentAt: null, updatedAt: now })
    .where(and(eq(mailOutbox.id, row.id), eq(mailOutbox.status, whileStatus)));
  if (failed) {
    console.error(`[mail] outbox ${row.id} failed for good after ${attempts} attempt(s): ${lastError}`);
  } else {
    console.warn(`[mail] outbox ${row.id} attempt ${attempts} failed, will retry: ${lastError}`);
  }
  return failed ? "failed" : "retry";
}

type DeliverySettings = Required<Omit<DeliverOptions, "observer" | "limit" | "ids">> &
  Pick<DeliverOptions, "observer" | "ids">;
type Settled = { id: number; outcome: DeliveryOutcome };

async function deliverNext(settings: DeliverySettings): Promise<Settled | null> {
  const { now, smtp, observer, maxAttempts, backoff, ids } = settings;
  // Held outside the transaction so a failed commit can drop the unfinished message.
  const inflight: { delivery?: PhasedDelivery } = {};
  let claim: Settled | { row: OutboxMail; delivery: PhasedDelivery } | null;
  try {
    claim = await db.transaction(async (tx) => {
      await tx.execute(sql.raw(`SET LOCAL idle_in_transaction_session_timeout = '${OUTBOX_POLICY.lockTimeout}'`));
      const [row] = await tx
        .select()
        .from(mailOutbox)
        .where(and(dueCondition(now, backoff), ids ? inArray(mailOutbox.id, [...ids]) : undefined))
        .orderBy(asc(mailOutbox.id))
        .limit(1)
        .for("update", { skipLocked: true });
      if (!row) return null;
      await observer?.("claimed", row);
      try {
        const composed = await composeOutboxMail(row);
        inflight.delivery = await beginDelivery(smtp, composed.envelope, composed.raw);
      } catch (error) {
        return { id: row.id, outcome: await recordFailure(tx, row, error, now, maxAttempts, "queued") };
      }
      await observer?.("data", row);
      await tx
        .update(mailOutbox)
        .set({ status: "sent", attempts: row.attempts + 1, sentAt: now, lastError: null, updatedAt: now })
        .where(eq(mailOutbox.id, row.id));
      return { row, delivery: inflight.delivery };
    });
  } catch (error) {
    // The transaction did not commit: drop the unfinished message so the server discards it.
    inflight.delivery?.abort();
    throw error;
  }
  if (!claim || "outcome" in claim) return claim;

  const { row, delivery } = claim;
  await observer?.("committed", row);
  try {
    await delivery.finish();
  } catch (error) {
    if (error instanceof DeliveryError && error.acceptance === "unknown") {
      const note = `the connection broke after the message was complete; the server may have accepted it: ${describe(error)}`;
      await db
        .update(mailOutbox)
        .set({ lastError: note.slice(0, 500), updatedAt: now })
        .where(eq(mailOutbox.id, row.id));
      console.warn(`[mail] outbox ${row.id}: ${note}`);
      return { id: row.id, outcome: "unknown" };
    }
    return { id: row.id, outcome: await recordFailure(db, row, error, now, maxAttempts, "sent") };
  }
  // The server has it: a link with a raw token must not stay at rest in the outbox. Rows queued the
  // current way carry no link at all (lib/mail/invitations.ts); this drops one queued with a `url`.
  // Only now, not at the commit above: a refusal after the final dot puts the row back in the queue,
  // and the retry must still be able to render the link.
  if (row.kind === "invitation" && "url" in (row.data ?? {})) {
    await db.execute(sql`UPDATE mail_outbox SET data = data - 'url' WHERE id = ${row.id} AND kind = 'invitation'`);
  }
  await observer?.("accepted", row);
  return { id: row.id, outcome: "sent" };
}

/** Sends every due queued row, one at a time, until none is due or `limit` rows were handled. */
export async function deliverDueMail(options: DeliverOptions = {}): Promise<DeliveryReport> {
  const settings = {
    now: options.now ?? new Date(),
    smtp: options.smtp ?? smtpSettingsFromEnv(),
    observer: options.observer,
    maxAttempts: options.maxAttempts ?? OUTBOX_POLICY.maxAttempts,
    backoff: options.backoff ?? OUTBOX_POLICY.backoff,
    ids: options.ids,
  };
  const report: DeliveryReport = { sent: [], retry: [], failed: [], unknown: [] };
  const limit = options.limit ?? 100;
  for (let handled = 0; handled < limit; handled++) {
    const step = await deliverNext(settings);
    if (!step) break;
    report[step.outcome].push(step.id);
    // A row that just failed is not due again until its back-off passes, so the loop moves on.
  }
  return report;
}
