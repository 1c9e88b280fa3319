import { todayIn } from "@/lib/permits/dates";

// Time, injectable. Jobs take `now` from a Clock instead of calling `new Date()` deep inside, so
// tests and the dev clock command (scripts/clock.ts) can run them at any moment.

export type Clock = () => Date;

export const systemClock: Clock = () => new Date();

/**
 * The instant at `hour`:00 local time on `isoDay` in `timeZone`, e.g. the daily reminder run of a
 * given day. Found by correcting a UTC guess with the zone's offset at that moment (twice, so a
 * daylight-saving change between the guess and the answer is taken into account).
 */
export function instantAt(isoDay: string, timeZone: string, hour = 6): Date {
  const [y, m, d] = isoDay.split("-").map(Number);
  const wanted = Date.UTC(y, m - 1, d, hour);
  let guess = wanted;
  for (let i = 0; i < 2; i++) guess = wanted - offsetMs(new Date(guess), timeZone);
  const result = new Date(guess);
  if (todayIn(timeZone, result) !== isoDay) throw new Error(`no ${hour}:00 on ${isoDay} in ${timeZone}`);
  return result;
}

/** The zone's offset from UTC at `at`, in milliseconds (positive east of Greenwich). */
export function offsetMs(at: Date, timeZone: string): number {
  let format: Intl.DateTimeFormat;
  try {
    format = new Intl.DateTimeFormat("en-US", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
    });
  } catch {
    return 0;
  }
  const p = Object.fromEntries(format.formatToParts(at).map((part) => [part.type, part.value]));
  const wall = Date.UTC(
    Number(p.year),
    Number(p.month) - 1,
    Number(p.day),
    Number(p.hour),
    Number(p.minute),
    Number(p.second),
  );
  return wall - Math.floor(at.getTime() / 1000) * 1000;
}
