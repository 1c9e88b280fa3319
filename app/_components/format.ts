// Display formats shared by screens. Dates read the same everywhere: "12 Mar 2026". Times are shown in
// the institution's time zone (institution_settings.time_zone, read with institutionTimeZone()) with the
// zone named, never in the server's or the reader's zone: "12 Mar 2026, 15:05 Europe/Berlin".

const dateFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric" });

/** The zone if this runtime knows it, else UTC (a mistyped setting must not break every page). */
function knownZone(timeZone: string): string {
  try {
    new Intl.DateTimeFormat("en-GB", { timeZone });
    return timeZone;
  } catch {
    return "UTC";
  }
}

const zoneFormats = new Map<string, Intl.DateTimeFormat>();
function zoneFormat(timeZone: string, seconds: boolean): Intl.DateTimeFormat {
  const key = `${timeZone}|${seconds}`;
  let format = zoneFormats.get(key);
  if (!format) {
    format = new Intl.DateTimeFormat("en-GB", {
      timeZone,
      day: "numeric",
      month: "short",
      year: "numeric",
      hour: "2-digit",
      minute: "2-digit",
      ...(seconds ? { second: "2-digit" } : {}),
      hourCycle: "h23",
    });
    zoneFormats.set(key, format);
  }
  return format;
}

function toDate(value: Date | string): Date {
  return value instanceof Date ? value : new Date(value);
}

export function formatDate(value: Date | string): string {
  return dateFormat.format(toDate(value));
}

/**
 * "12 Mar 2026, 15:05 Europe/Berlin": the instant in the institution's zone, the zone named by its
 * IANA name (abbreviations such as "CST" mean different zones in different places).
 */
export function formatDateTime(value: Date | string, timeZone: string, options: { seconds?: boolean } = {}): string {
  const zone = knownZone(timeZone);
  return `${zoneFormat(zone, options.seconds ?? false).format(toDate(value))} ${zone}`;
}

/**
 * A signature's time: in the institution's zone, and in UTC as the signed record holds it (security.md:
 * "the UTC time"): "12 Mar 2026, 15:05:09 Europe/Berlin (14:05:09 UTC)".
 */
export function formatSignedAt(value: Date | string, timeZone: string): string {
  const d = toDate(value);
  const local = formatDateTime(d, timeZone, { seconds: true });
  if (knownZone(timeZone) === "UTC") return local;
  return `${local} (${d.toISOString().slice(11, 19)} UTC)`;
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
