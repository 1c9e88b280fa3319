import "server-only";
import { and, asc, eq, inArray, isNull, lt, sql } from "drizzle-orm";
import { db } from "@/db";
import { applications, decisions, permits, users } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { readInstitutionSettings } from "@/lib/settings/queries";
import { queueMail } from "@/lib/outbox";
import { addDays, todayIn } from "@/lib/permits/dates";
import { currentReminderRules } from "@/lib/rules/queries";
import { runTrainingReminders, type TrainingReminderReport } from "@/lib/training/reminders";
import { queueInspectionReminders, type InspectionReminderReport } from "@/lib/upkeep/actions";
import { DEFAULT_SCHEDULE, CATCH_UP_DAYS, reminderDue, reminderKey, type ReminderPlan } from "./reminders";

// The daily permit job (scheduled by lib/jobs/worker.ts at 06:00 in the institution's time zone,
// run once more whenever a worker starts, and on demand with `npm run clock`).
//
// What it does, for the calendar day `now` falls on in the institution's time zone:
//   1. stores state = expired for active permits whose last valid day has passed (with an audit row);
//   2. queues the reminder each permit is due (lib/jobs/reminders.ts): to the holder before expiry,
//      and on expiry to the holder and the reviewer who signed. Revoked and renewed permits get none.
// How it avoids repeats: each reminder is an outbox row with the unique key
// reminder:<permit>:<kind>:<due date>:<recipient> (mail_outbox.dedupe_key is UNIQUE), inserted with
// ON CONFLICT DO NOTHING. A second run, the same day or later, or a second worker running at the same
// moment, inserts nothing: PostgreSQL's unique index makes the later insert wait for the first and
// then skip. The outbox worker then sends each row at most once (lib/mail/actions.ts).

export type ReminderRunReport = {
  today: string;
  timeZone: string;
  schedule: number[];
  expired: string[];
  queued: { permitId: string; number: string; kind: string; dueDate: string; to: string[] }[];
  /** Apparatus whose inspection fell due: one reminder each to the owner (lib/upkeep). */
  inspections: InspectionReminderReport;
  /** Courses lapsing within 30 or 7 days: one reminder each to the person and the officers (lib/training). */
  training: TrainingReminderReport;
};

type Candidate = {
  id: string;
  number: string;
  state: "active" | "expired" | "revoked";
  validTo: string;
  issuedAt: Date;
  revisionId: string;
  title: string;
  holderName: string;
  holderEmail: string;
  holderDisabled: Date | null;
};

/** Marks active permits whose last valid day is before `today` as expired; returns their ids. */
export async function expirePermits(today: string, now: Date): Promise<string[]> {
  return db.transaction(async (tx) => {
    // The state guard makes a concurrent run update (and audit) each permit once.
    const rows = await tx
      .update(permits)
      .set({ state: "expired", version: sql`${permits.version} + 1`, updatedAt: now })
      .where(and(eq(permits.state, "active"), lt(permits.validTo, today)))
      .returning({ id: permits.id, number: permits.number, validTo: permits.validTo });
    for (const row of rows) {
      await writeAudit(tx, {
        actor: null,
        action: "permit.expired",
        entityType: "permit",
        entityId: row.id,
        data: { number: row.number, validTo: row.validTo, today },
      });
    }
    return rows.map((r) => r.id);
  });
}

async function reminderSchedule(): Promise<number[]> {
  try {
    const { rules } = await currentReminderRules();
    return rules.daysBefore.length > 0 ? [...rules.daysBefore] : [...DEFAULT_SCHEDULE];
  } catch (error) {
    console.error("[reminders] could not read the reminder rules; using the default schedule:", error);
    return [...DEFAULT_SCHEDULE];
  }
}

async function candidates(today: string, schedule: number[]): Promise<Candidate[]> {
  const furthest = Math.max(...schedule, 0);
  return db
    .select({
      id: permits.id,
      number: permits.number,
      state: permits.state,
      validTo: permits.validTo,
      issuedAt: permits.issuedAt,
      revisionId: permits.revisionId,
      title: applications.title,
      holderName: users.name,
      holderEmail: users.email,
      holderDisabled: users.disabledAt,
    })
    .from(permits)
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .innerJoin(users, eq(users.id, permits.holderId))
    .where(
      and(
        inArray(permits.state, ["active", "expired"]),
        // Renewing a permit stops its reminders.
        isNull(permits.renewedByApplicationId),
        sql`${permits.validTo} >= ${addDays(today, -(CATCH_UP_DAYS + 1))}::date`,
        sql`${permits.validTo} <= ${addDays(today, furthest)}::date`,
      ),
    )
    .orderBy(asc(permits.validTo), asc(permits.number));
}

/** The reviewer who signed the first step of the permit's revision (none for self-certified ones). */
async function signingReviewerEmail(revisionId: string): Promise<string | null> {
  const [row] = await db
    .select({ email: users.email })
    .from(decisions)
    .innerJoin(users, eq(users.id, decisions.signerId))
    .where(
      and(
        eq(decisions.revisionId, revisionId),
        eq(decisions.step, 1),
        inArray(decisions.kind, ["recommend", "approve"]),
        isNull(users.disabledAt),
      ),
    )
    .limit(1);
  return row?.email ?? null;
}

async function queueReminder(permit: Candidate, plan: ReminderPlan) {
  const expired = plan.threshold === 0;
  const reviewer = expired ? await signingReviewerEmail(permit.revisionId) : null;
  const key = reminderKey(permit.id, plan);
  const base = {
    permitId: permit.id,
    permitNumber: permit.number,
    title: permit.title,
    validTo: permit.validTo,
    daysLeft: plan.daysLeft,
  };
  return db.transaction(async (tx) => {
    const to: string[] = [];
    if (!permit.holderDisabled) {
      const n = await queueMail(
        tx,
        permit.holderEmail,
        { kind: "permit_reminder", data: { ...base, recipient: "holder" } },
        { dedupeKey: key },
      );
      if (n > 0) to.push(permit.holderEmail);
    }
    if (reviewer && reviewer.toLowerCase() !== permit.holderEmail.toLowerCase()) {
      const n = await queueMail(
        tx,
        reviewer,
        { kind: "permit_reminder", data: { ...base, recipient: "reviewer", holderName: permit.holderName } },
        { dedupeKey: key },
      );
      if (n > 0) to.push(reviewer);
    }
    if (to.length > 0) {
      await writeAudit(tx, {
        actor: null,
        action: "permit.reminder_queued",
        entityType: "permit",
        entityId: permit.id,
        data: { number: permit.number, reminder: plan.kind, dueDate: plan.dueDate, daysLeft: plan.daysLeft, to },
      });
    }
    return to;
  });
}

export async function runReminders(options: { now?: Date } = {}): Promise<ReminderRunReport> {
  const now = options.now ?? new Date();
  const { timeZone } = await readInstitutionSettings();
  const today = todayIn(timeZone, now);
  const schedule = await reminderSchedule();
  const expired = await expirePermits(today, now);
  const report: ReminderRunReport = { today, timeZone, schedule, expired, queued: [], inspections: [], training: [] };
  for (const permit of await candidates(today, schedule)) {
    const plan = reminderDue({
      today,
      validTo: permit.validTo,
      issuedOn: todayIn(timeZone, permit.issuedAt),
      schedule,
    });
    if (!plan) continue;
    // Only the expiry notice goes out once a permit has ended; earlier reminders need an active one.
    if (plan.threshold > 0 && permit.validTo < today) continue;
    const to = await queueReminder(permit, plan);
    if (to.length > 0)
      report.queued.push({ permitId: permit.id, number: permit.number, kind: plan.kind, dueDate: plan.dueDate, to });
  }
  report.inspections = await queueInspectionReminders(today, timeZone);
  report.training = await runTrainingReminders(today);
  return report;
}
