// The review queue's capped counts, as numbers and as people read them (server and browser alike).

/**
 * The queue's counts stop at this many and read "100+". Counting every waiting application, each with
 * its separation-of-duties checks, costs time in proportion to the backlog (130–180 ms a statement at
 * 10,000 waiting), and past a hundred the exact figure does not change what a reviewer does next. The
 * pages still walk every waiting application.
 */
export const QUEUE_COUNT_CAP = 100;

/** A capped count as people read it: "100+" past the cap. */
export function cappedCount(n: number): string {
  return n > QUEUE_COUNT_CAP ? `${QUEUE_COUNT_CAP}+` : String(n);
}

/** The sum of capped counts as people read it: "203+" when any of them passed the cap. */
export function cappedSum(counts: Partial<Record<number, number>>): { n: number; label: string } {
  const values = Object.values(counts).map((v) => v ?? 0);
  const n = values.reduce((sum, v) => sum + Math.min(v, QUEUE_COUNT_CAP), 0);
  return { n, label: values.some((v) => v > QUEUE_COUNT_CAP) ? `${n}+` : String(n) };
}
