// Display formats shared by screens. Dates read the same everywhere: "12 Mar 2026". Call these in
// server components: they use the server's time zone (the institution's), so a client render could differ.

const dateFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric" });
const dateTimeFormat = new Intl.DateTimeFormat("en-GB", {
  day: "numeric",
  month: "short",
  year: "numeric",
  hour: "2-digit",
  minute: "2-digit",
  timeZoneName: "short",
});

function toDate(value: Date | string): Date {
  return value instanceof Date ? value : new Date(value);
}

export function formatDate(value: Date | string): string {
  return dateFormat.format(toDate(value));
}

export function formatDateTime(value: Date | string): string {
  return dateTimeFormat.format(toDate(value));
}

/** ISO form for <time dateTime>. */
export function isoDate(value: Date | string): string {
  return toDate(value).toISOString();
}

const DAY_MS = 86_400_000;

/** Whole days from `now` until `value`, rounded up; negative once past. */
export function daysUntil(value: Date | string, now: Date = new Date()): number {
  return Math.ceil((toDate(value).getTime() - now.getTime()) / DAY_MS);
}

/** "today", "in 1 day", "in 12 days", "3 days ago". */
export function relativeDays(days: number): string {
  if (days === 0) return "today";
  if (days > 0) return `in ${days} ${days === 1 ? "day" : "days"}`;
  const n = -days;
  return `${n} ${n === 1 ? "day" : "days"} ago`;
}
