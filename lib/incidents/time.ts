// A wall-clock time typed into a datetime-local field ("2026-12-01T14:30") means that time in the
// institution's zone, not the server's or the browser's. Pure; corrected twice like the daily job's
// instantAt (lib/jobs/clock.ts), so a daylight-saving change between guess and answer is taken into
// account. An instant with an offset ("…Z", "…+01:00") is taken as it is.

function offsetMs(at: Date, timeZone: string): number {
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
  const wall = Date.UTC(+p.year, +p.month - 1, +p.day, +p.hour, +p.minute, +p.second);
  return wall - Math.floor(at.getTime() / 1000) * 1000;
}

export function wallTimeToInstant(value: string, timeZone: string): Date {
  const local = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/.exec(value);
  if (!local) return new Date(value);
  const [, y, mo, d, h, mi, s] = local;
  const wanted = Date.UTC(+y, +mo - 1, +d, +h, +mi, s ? +s : 0);
  let guess = wanted;
  for (let i = 0; i < 2; i++) guess = wanted - offsetMs(new Date(guess), timeZone);
  return new Date(guess);
}

/** "2026-12-01T14:30" in `timeZone`: the value a datetime-local field shows for an instant. */
export function instantToWallTime(at: Date, timeZone: string): string {
  const shifted = new Date(at.getTime() + offsetMs(at, timeZone));
  return shifted.toISOString().slice(0, 16);
}
