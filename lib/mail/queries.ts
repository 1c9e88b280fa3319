import "server-only";
import { and, count, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { joinPermitBase } from "@/lib/permits/base-query";
import { applicationRevisions, applications, departments, mailOutbox, permits, users } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { readInstitutionSettings } from "@/lib/settings/queries";

// Reads for the outbox: what a message's body needs besides its own data (institution, permit
// details, how the recipient relates to the permit), which rows are due, and the outbox as the
// /dev/mail page lists it.

export const OUTBOX_STATUSES = ["queued", "sent", "failed"] as const;
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number];

export type Institution = { name: string; timeZone: string };

/** The institution's name and time zone as mail words them. */
export async function institution(tx: DbOrTx = db): Promise<Institution> {
  const { name, timeZone } = await readInstitutionSettings(tx);
  return { name: name ?? "your institution", timeZone };
}

export type PermitMailFacts = {
  id: string;
  number: string;
  tier: number;
  state: "active" | "expired" | "revoked";
  validFrom: string;
  validTo: string;
  conditions: string[];
  title: string;
  room: string | null;
  holderEmail: string;
  namedUserIds: string[];
  updatedAt: Date;
  version: number;
};

/** The permit facts a mail about it prints and attaches, or null when the permit is gone. */
export async function permitMailFacts(permitId: string, tx: DbOrTx = db): Promise<PermitMailFacts | null> {
  if (!/^[0-9a-f-]{36}$/i.test(permitId)) return null;
  const [row] = await joinPermitBase(
    tx
      .select({
        id: permits.id,
        number: permits.number,
        tier: permits.tier,
        state: permits.state,
        validFrom: permits.validFrom,
        validTo: permits.validTo,
        conditions: permits.conditions,
        title: applications.title,
        room: sql<string | null>`${applicationRevisions.content} -> 'event' ->> 'room'`,
        holderEmail: users.email,
        namedUserIds: applications.namedUserIds,
        updatedAt: permits.updatedAt,
        version: permits.version,
      })
      .from(permits)
      .$dynamic(),
  )
    .where(eq(permits.id, permitId))
    .limit(1);
  return row ?? null;
}

/** The department an application belongs to, for "you review applications for …". */
export async function applicationDepartmentName(applicationId: string, tx: DbOrTx = db): Promise<string | null> {
  if (!/^[0-9a-f-]{36}$/i.test(applicationId)) return null;
  const [row] = await tx
    .select({ name: departments.name })
    .from(applications)
    .innerJoin(departments, eq(departments.id, applications.departmentId))
    .where(eq(applications.id, applicationId))
    .limit(1);
  return row?.name ?? null;
}

/**
 * The SQL condition "this queued row may be tried now": never tried, or its back-off since the last
 * failed attempt has passed. Back-off doubles from `baseSeconds` per attempt up to `capSeconds`.
 */
export function dueCondition(now: Date, backoff: { baseSeconds: number; capSeconds: number }) {
  return and(
    eq(mailOutbox.status, "queued"),
    sql`(${mailOutbox.attempts} = 0 OR ${mailOutbox.updatedAt} + make_interval(secs => least(${backoff.baseSeconds}::float8 * power(2, ${mailOutbox.attempts} - 1), ${backoff.capSeconds}::float8)) <= ${now.toISOString()}::timestamptz)`,
  )!;
}

export async function hasDueMail(now: Date, backoff: { baseSeconds: number; capSeconds: number }): Promise<boolean> {
  const [row] = await db.select({ id: mailOutbox.id }).from(mailOutbox).where(dueCondition(now, backoff)).limit(1);
  return Boolean(row);
}

export type OutboxListRow = {
  id: number;
  kind: string;
  toAddress: string;
  subject: string;
  status: string;
  attempts: number;
  lastError: string | null;
  createdAt: Date;
  sentAt: Date | null;
  updatedAt: Date;
};

/** When a queued row is next tried: the same back-off as dueCondition (null once sent or failed). */
export function nextAttemptAt(
  row: Pick<OutboxListRow, "status" | "attempts" | "updatedAt">,
  backoff: { baseSeconds: number; capSeconds: number },
): Date | null {
  if (row.status !== "queued") return null;
  if (row.attempts === 0) return row.updatedAt;
  const seconds = Math.min(backoff.baseSeconds * 2 ** (row.attempts - 1), backoff.capSeconds);
  return new Date(row.updatedAt.getTime() + seconds * 1000);
}

/** Outbox rows for /dev/mail: queued and failed first (they need attention), then the newest. */
export async function listOutbox(
  options: { limit?: number; statuses?: OutboxStatus[] } = {},
): Promise<OutboxListRow[]> {
  return db
    .select({
      id: mailOutbox.id,
      kind: mailOutbox.kind,
      toAddress: mailOutbox.toAddress,
      subject: mailOutbox.subject,
      status: mailOutbox.status,
      attempts: mailOutbox.attempts,
      lastError: mailOutbox.lastError,
      createdAt: mailOutbox.createdAt,
      sentAt: mailOutbox.sentAt,
      updatedAt: mailOutbox.updatedAt,
    })
    .from(mailOutbox)
    .where(options.statuses ? inArray(mailOutbox.status, options.statuses) : undefined)
    .orderBy(sql`(${mailOutbox.status} = 'sent')`, desc(mailOutbox.id))
    .limit(Math.min(options.limit ?? 100, 500));
}

export async function outboxCounts(): Promise<Record<OutboxStatus, number>> {
  const rows = await db.select({ status: mailOutbox.status, n: count() }).from(mailOutbox).groupBy(mailOutbox.status);
  const out: Record<OutboxStatus, number> = { queued: 0, sent: 0, failed: 0 };
  for (const row of rows) if (row.status in out) out[row.status as OutboxStatus] = Number(row.n);
  return out;
}
