import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/db";
import { writeAudit } from "@/lib/audit";
import { usersWithPermission } from "@/lib/auth/holders";
import { queueMail } from "@/lib/outbox";
import { addDays, daysFromTo } from "@/lib/permits/dates";

// Reminders before a course lapses (issue 17), run by the daily permit job (lib/jobs/actions.ts) with
// the same outbox and once-only keys as permit reminders: each is an outbox row with the unique key
// training:<person>:<course>:<lapse day>:<threshold>:<recipient>, inserted with ON CONFLICT DO NOTHING,
// so a second run (the same day, later, or a second worker) queues nothing. A newer completion moves
// the lapse day, so its own reminders come due in their time.
//
// Schedule: 30 and 7 days before the lapse day (common practice: a month's notice to book a refresher,
// a week's as the last call). A missed run is caught up within CATCH_UP_DAYS; only the most recent
// threshold due is sent. Sent to the person and to the safety officers (holders of training.reminded).

export const TRAINING_REMINDER_DAYS = [30, 7] as const;
export const TRAINING_CATCH_UP_DAYS = 7;

export type TrainingReminderPlan = { threshold: number; dueDate: string; daysLeft: number };

/** Which reminder a course lapsing on `lapsesOn` is due `today`, or null. Pure calendar arithmetic. */
export function trainingReminderDue(today: string, lapsesOn: string): TrainingReminderPlan | null {
  if (lapsesOn <= today) return null;
  let best: { threshold: number; due: string } | null = null;
  for (const threshold of TRAINING_REMINDER_DAYS) {
    const due = addDays(lapsesOn, -threshold);
    if (due <= today && (!best || due > best.due)) best = { threshold, due };
  }
  if (!best || best.due < addDays(today, -TRAINING_CATCH_UP_DAYS)) return null;
  return { threshold: best.threshold, dueDate: best.due, daysLeft: daysFromTo(today, lapsesOn) };
}

export function trainingReminderKey(input: {
  userId: string;
  courseTypeId: string;
  lapsesOn: string;
  threshold: number;
}): string {
  return `training:${input.userId}:${input.courseTypeId}:${input.lapsesOn}:${input.threshold}d`;
}

export type TrainingReminderReport = { userId: string; course: string; lapsesOn: string; to: string[] }[];

/** Queues the training reminders due `today`; returns those queued (none on a repeated run). */
export async function runTrainingReminders(today: string): Promise<TrainingReminderReport> {
  const furthest = Math.max(...TRAINING_REMINDER_DAYS);
  // The latest completion per person and course, for active people and courses not retired, lapsing
  // within the schedule's reach.
  const rows = await db.execute<{
    user_id: string;
    name: string;
    email: string;
    course_type_id: string;
    course: string;
    record_id: string;
    lapses_on: string;
  }>(sql`
    SELECT * FROM (
      SELECT DISTINCT ON (tr.user_id, tr.course_type_id)
        tr.user_id, u.name, u.email, tr.course_type_id, ct.name AS course, tr.id AS record_id,
        (tr.completed_on + make_interval(months => ct.validity_months::int))::date::text AS lapses_on
      FROM training_record tr
      JOIN course_type ct ON ct.id = tr.course_type_id AND ct.retired_at IS NULL
      JOIN app_user u ON u.id = tr.user_id AND u.disabled_at IS NULL
      WHERE tr.removed_at IS NULL
      ORDER BY tr.user_id, tr.course_type_id, tr.completed_on DESC
    ) latest
    WHERE lapses_on::date > ${today}::date AND lapses_on::date <= ${addDays(today, furthest)}::date
    ORDER BY lapses_on, name
  `);
  const report: TrainingReminderReport = [];
  // The officers once per run, not once per lapsing record.
  const officers = rows.rows.length > 0 ? await usersWithPermission(db, "training.reminded", "institution") : [];
  for (const r of rows.rows) {
    const plan = trainingReminderDue(today, r.lapses_on);
    if (!plan) continue;
    const key = trainingReminderKey({
      userId: r.user_id,
      courseTypeId: r.course_type_id,
      lapsesOn: r.lapses_on,
      threshold: plan.threshold,
    });
    const base = { personName: r.name, course: r.course, lapsesOn: r.lapses_on, daysLeft: plan.daysLeft };
    const to = await db.transaction(async (tx) => {
      const sent: string[] = [];
      if (
        (await queueMail(
          tx,
          r.email,
          { kind: "training_reminder", data: { ...base, recipient: "person" } },
          { dedupeKey: key },
        )) > 0
      ) {
        sent.push(r.email);
      } else {
        // Already queued by an earlier run, with the officers' copies in the same transaction: a
        // repeated run costs one insert per lapsing record, not one per record and officer.
        return sent;
      }
      for (const officer of officers.filter((o) => o.email.toLowerCase() !== r.email.toLowerCase())) {
        const n = await queueMail(
          tx,
          officer.email,
          { kind: "training_reminder", data: { ...base, recipient: "officer" } },
          { dedupeKey: key },
        );
        if (n > 0) sent.push(officer.email);
      }
      if (sent.length > 0) {
        await writeAudit(tx, {
          actor: null,
          action: "training.reminder_queued",
          entityType: "training_record",
          entityId: r.record_id,
          data: { userId: r.user_id, course: r.course, lapsesOn: r.lapses_on, threshold: plan.threshold, to: sent },
        });
      }
      return sent;
    });
    if (to.length > 0) report.push({ userId: r.user_id, course: r.course, lapsesOn: r.lapses_on, to });
  }
  return report;
}
