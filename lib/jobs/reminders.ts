import { addDays, daysFromTo } from "@/lib/permits/dates";

// Which reminder a permit is due today: pure calendar arithmetic, no I/O (lib/jobs/actions.ts runs it
// against the database every day).
//
// Days are calendar days in the institution's time zone. A permit is valid through its last valid
// day (validTo, inclusive) and expires at the end of that day. A schedule entry of N days means
// "N days before expiry": the reminder is due on validTo + 1 − N, so 1 arrives on the last valid day
// and 0 on the day after it, when the permit has just expired. `daysLeft` counts the valid days
// that remain, today included.
//
// A run that was missed (the worker was down) is caught up: the most recent reminder that came due
// in the last CATCH_UP_DAYS is sent, older ones that a newer one replaces are skipped. A reminder
// that came due before the permit was issued (short validity windows) is skipped too.

export const DEFAULT_SCHEDULE = [30, 7, 1, 0] as const;
export const CATCH_UP_DAYS = 7;

export type ReminderPlan = {
  /** Days before expiry this reminder belongs to (0 = expired). */
  threshold: number;
  /** "30d", "7d", "1d" … or "expired": part of the reminder's unique key. */
  kind: string;
  /** The day the reminder came due: part of its unique key. */
  dueDate: string;
  daysLeft: number;
};

export function reminderKind(threshold: number): string {
  return threshold === 0 ? "expired" : `${threshold}d`;
}

/** reminder:<permitId>:<kind>:<dueDate>; the outbox appends the recipient. */
export function reminderKey(permitId: string, plan: Pick<ReminderPlan, "kind" | "dueDate">): string {
  return `reminder:${permitId}:${plan.kind}:${plan.dueDate}`;
}

export function daysLeft(today: string, validTo: string): number {
  return Math.max(0, daysFromTo(today, validTo) + 1);
}

export function dueDate(validTo: string, threshold: number): string {
  return addDays(validTo, 1 - threshold);
}

export function reminderDue(input: {
  today: string;
  validTo: string;
  /** The calendar day the permit was issued, in the same time zone. */
  issuedOn: string;
  schedule: readonly number[];
  catchUpDays?: number;
}): ReminderPlan | null {
  const { today, validTo, issuedOn } = input;
  let best: { threshold: number; due: string } | null = null;
  for (const threshold of new Set(input.schedule)) {
    if (!Number.isInteger(threshold) || threshold < 0) continue;
    const due = dueDate(validTo, threshold);
    if (due <= today && (!best || due > best.due)) best = { threshold, due };
  }
  if (!best) return null;
  if (best.due < addDays(today, -(input.catchUpDays ?? CATCH_UP_DAYS))) return null;
  // The approval mail covers the day of issue; a reminder is for later days.
  if (best.due <= issuedOn) return null;
  return {
    threshold: best.threshold,
    kind: reminderKind(best.threshold),
    dueDate: best.due,
    daysLeft: daysLeft(today, validTo),
  };
}
