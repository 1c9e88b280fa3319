// Permit days are calendar days in the institution's time zone (institution_settings.time_zone),
// written as ISO dates (YYYY-MM-DD). A validity window is inclusive at both ends: a permit valid
// from 2026-03-01 to 2026-03-30 holds 30 days. Pure functions, shared by server and pages.

import type { PermitState } from "@/db/schema/permits";

const ISO_DAY = /^\d{4}-\d{2}-\d{2}$/;
const DAY_MS = 86_400_000;

// One formatter per time zone: making an Intl.DateTimeFormat costs far more than using one (it was
// about 5 % of the public status page's CPU time, docs/performance.md), and a process sees one or two
// zones. An unknown zone counts as UTC.
const dayFormats = new Map<string, Intl.DateTimeFormat>();
function dayFormat(timeZone: string): Intl.DateTimeFormat {
  let format = dayFormats.get(timeZone);
  if (!format) {
    const options = { year: "numeric", month: "2-digit", day: "2-digit" } as const;
    try {
      format = new Intl.DateTimeFormat("en-CA", { ...options, timeZone });
    } catch {
      format = new Intl.DateTimeFormat("en-CA", { ...options, timeZone: "UTC" });
    }
    if (dayFormats.size < 64) dayFormats.set(timeZone, format);
  }
  return format;
}

/** The calendar day `now` falls on in `timeZone` (an IANA name; an unknown one counts as UTC). */
export function todayIn(timeZone: string, now: Date = new Date()): string {
  const parts = Object.fromEntries(
    dayFormat(timeZone)
      .formatToParts(now)
      .map((p) => [p.type, p.value]),
  );
  return `${parts.year}-${parts.month}-${parts.day}`;
}

function dayNumber(isoDay: string): number {
  if (!ISO_DAY.test(isoDay)) throw new Error(`not an ISO date: ${isoDay}`);
  return Date.UTC(Number(isoDay.slice(0, 4)), Number(isoDay.slice(5, 7)) - 1, Number(isoDay.slice(8, 10))) / DAY_MS;
}

export function isIsoDay(value: string): boolean {
  if (!ISO_DAY.test(value)) return false;
  const d = new Date(`${value}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === value;
}

export function addDays(isoDay: string, days: number): string {
  return new Date((dayNumber(isoDay) + days) * DAY_MS).toISOString().slice(0, 10);
}

/** Days from `from` to `to`, both counted: the same day is 1. */
export function inclusiveDays(from: string, to: string): number {
  return dayNumber(to) - dayNumber(from) + 1;
}

/** Whole days from `today` until `day` (0 on the day itself, negative once past). */
export function daysFromTo(today: string, day: string): number {
  return dayNumber(day) - dayNumber(today);
}

/**
 * What a permit is now: revoked if revoked, expired once its last valid day has passed in the
 * institution's time zone, else active. The stored state may still say active for an expired permit
 * until the daily job catches up; screens and checks use this.
 */
export function effectivePermitState(permit: { state: PermitState; validTo: string }, today: string): PermitState {
  if (permit.state === "revoked") return "revoked";
  // Stored only by the daily job once the last day has passed (possibly run with a moved clock, as
  // `npm run clock` does): an expired permit never becomes active again.
  if (permit.state === "expired" || permit.validTo < today) return "expired";
  return "active";
}

/** The days an application asks for (its event's first and last day), when both are real dates. */
export type EventDays = { firstDay: string; lastDay: string };

export function eventDaysOf(content: unknown): EventDays | null {
  const event = (content as { event?: { firstDay?: unknown; lastDay?: unknown } } | null)?.event;
  const firstDay = typeof event?.firstDay === "string" ? event.firstDay : "";
  const lastDay = typeof event?.lastDay === "string" ? event.lastDay : "";
  if (!isIsoDay(firstDay) || !isIsoDay(lastDay) || lastDay < firstDay) return null;
  return { firstDay, lastDay };
}

/**
 * The window a permit gets when nobody changes it: the event days, from today at the earliest (a
 * permit never starts in the past), cut to the tier's longest validity. A permit is for the event it
 * was asked for, not for the tier's longest allowance. Without event days: from today for the longest
 * validity (only a revision frozen under an older shape has none).
 */
export function defaultValidity(
  event: EventDays | null,
  validityDays: number,
  today: string,
): { validFrom: string; validTo: string } {
  if (!event) return { validFrom: today, validTo: addDays(today, validityDays - 1) };
  const validFrom = event.firstDay > today ? event.firstDay : today;
  const longest = addDays(validFrom, validityDays - 1);
  let validTo = event.lastDay < longest ? event.lastDay : longest;
  // The event is over before it could start: a one-day window, which the approver must widen with a reason.
  if (validTo < validFrom) validTo = validFrom;
  return { validFrom, validTo };
}

/** Whether a window reaches beyond the event days (then the approver must give a reason). */
export function widensEvent(window: { validFrom: string; validTo: string }, event: EventDays | null): boolean {
  if (!event) return false;
  return window.validFrom < event.firstDay || window.validTo > event.lastDay;
}
