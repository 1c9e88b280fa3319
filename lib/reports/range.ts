// The report's calendar: default range and months, in institution days (YYYY-MM-DD). Pure.

const DAY_MS = 86_400_000;

export function addDaysIso(iso: string, days: number): string {
  return new Date(Date.parse(`${iso}T00:00:00Z`) + days * DAY_MS).toISOString().slice(0, 10);
}

/** The default range: the first day of the month eleven months back, to today (twelve months shown). */
export function defaultRange(today: string): { from: string; to: string } {
  const y = Number(today.slice(0, 4));
  const m = Number(today.slice(5, 7)) - 1 - 11;
  const first = new Date(Date.UTC(y, m, 1)).toISOString().slice(0, 10);
  return { from: first, to: today };
}

/** Every month from the one holding `from` to the one holding `to`, as YYYY-MM. */
export function monthsBetween(from: string, to: string): string[] {
  const out: string[] = [];
  let y = Number(from.slice(0, 4));
  let m = Number(from.slice(5, 7));
  const endY = Number(to.slice(0, 4));
  const endM = Number(to.slice(5, 7));
  while (y < endY || (y === endY && m <= endM)) {
    out.push(`${y}-${String(m).padStart(2, "0")}`);
    m += 1;
    if (m > 12) {
      m = 1;
      y += 1;
    }
  }
  return out;
}

/** Hours as a person reads a wait: "5.0 h" below two days, "3.2 d" above. */
export function formatHours(hours: number | null): string {
  if (hours === null) return "—";
  return hours < 48 ? `${hours.toFixed(1)} h` : `${(hours / 24).toFixed(1)} d`;
}
