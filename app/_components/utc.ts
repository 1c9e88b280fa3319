// Waiting times of the review queue. (Times of day are shown by format.ts in the institution's zone.)

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
