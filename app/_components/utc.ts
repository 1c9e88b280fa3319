// Signatures are shown in UTC (security.md: "the UTC time"), the same on every screen whatever the
// server's or the reader's zone: "2026-03-12 14:05:09 UTC".

export function formatUtc(value: Date | string): string {
  const d = value instanceof Date ? value : new Date(value);
  return `${d.toISOString().slice(0, 19).replace("T", " ")} UTC`;
}

/** Whole days waited since `since` (0 on the first day). */
export function daysWaiting(since: Date | string | null, now: Date = new Date()): number | null {
  if (!since) return null;
  const d = since instanceof Date ? since : new Date(since);
  return Math.max(0, Math.floor((now.getTime() - d.getTime()) / 86_400_000));
}

export function waitingText(days: number | null): string {
  if (days === null) return "—";
  if (days === 0) return "today";
  return days === 1 ? "1 day" : `${days} days`;
}
