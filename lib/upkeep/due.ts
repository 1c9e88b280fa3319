import { addDays, daysFromTo } from "@/lib/permits/dates";

// When an apparatus's next inspection is due: pure calendar arithmetic on the institution's days.
// The clock starts at the last inspection that passed (or ended in a repair); an apparatus never
// inspected counts from the day it was registered, so setting an interval on an old, never-inspected
// apparatus makes it due at once — on purpose: nobody has looked at it.

/** Days before the due day from which the registry shows "due soon" (14 days: common practice). */
export const DUE_SOON_DAYS = 14;

export type InspectionStatus = { dueOn: string; state: "ok" | "due_soon" | "due"; daysLeft: number };

export function inspectionStatus(input: {
  intervalDays: number | null;
  lastPassedOn: string | null;
  registeredOn: string;
  today: string;
}): InspectionStatus | null {
  if (!input.intervalDays) return null;
  const dueOn = addDays(input.lastPassedOn ?? input.registeredOn, input.intervalDays);
  const daysLeft = daysFromTo(input.today, dueOn);
  return { dueOn, daysLeft, state: daysLeft <= 0 ? "due" : daysLeft <= DUE_SOON_DAYS ? "due_soon" : "ok" };
}

/** inspection_due:<apparatusId>:<dueOn>; the outbox appends the recipient. */
export function inspectionReminderKey(apparatusId: string, dueOn: string): string {
  return `inspection_due:${apparatusId}:${dueOn}`;
}
