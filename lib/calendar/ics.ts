// iCalendar (RFC 5545) text for permits: the attachment on approval and the per-user feed. Pure
// functions, no I/O. What matters for interoperability: CRLF line ends, lines folded at 75 octets
// (never inside a UTF-8 character), TEXT values escaped (\ ; , and newlines), all-day events as
// VALUE=DATE with an exclusive DTEND, and a stable UID per event so calendars update, not duplicate.

export type CalendarEvent = {
  uid: string;
  /** First day, ISO YYYY-MM-DD (all-day). */
  startDay: string;
  /** Last day, inclusive, ISO YYYY-MM-DD; written as the exclusive DTEND of RFC 5545. */
  lastDay: string;
  summary: string;
  description?: string;
  location?: string;
  url?: string;
  status?: "CONFIRMED" | "CANCELLED";
  /** When this version of the event was made (DTSTAMP / LAST-MODIFIED). */
  stamp: Date;
  sequence?: number;
};

export type Calendar = {
  name: string;
  /** PUBLISH for feeds and attachments that are not invitations (RFC 5546). */
  method?: "PUBLISH";
  events: CalendarEvent[];
};

const PRODID = "-//Benchclear//Permits//EN";

/** Escapes a TEXT value (RFC 5545 §3.3.11); other control characters are dropped. */
export function escapeText(value: string): string {
  return value
    .replace(/\r\n|\r|\n/g, "\n")
    .replace(/[\u0000-\u0008\u000b-\u001f\u007f]/g, "")
    .replace(/\\/g, "\\\\")
    .replace(/;/g, "\\;")
    .replace(/,/g, "\\,")
    .replace(/\n/g, "\\n");
}

/** Folds one content line at 75 octets (RFC 5545 §3.1), continuation lines start with a space. */
export function foldLine(line: string): string {
  const parts: string[] = [];
  let current = "";
  let bytes = 0;
  // Continuation lines begin with one space, which counts towards their 75 octets.
  let limit = 75;
  for (const char of line) {
    const size = Buffer.byteLength(char, "utf8");
    if (bytes + size > limit) {
      parts.push(current);
      current = "";
      bytes = 0;
      limit = 74;
    }
    current += char;
    bytes += size;
  }
  parts.push(current);
  return parts.join("\r\n ");
}

function dateValue(isoDay: string): string {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(isoDay)) throw new Error(`not an ISO date: ${isoDay}`);
  return isoDay.replace(/-/g, "");
}

function nextDay(isoDay: string): string {
  const d = new Date(`${isoDay}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d.toISOString().slice(0, 10);
}

function utcStamp(date: Date): string {
  return date
    .toISOString()
    .replace(/[-:]/g, "")
    .replace(/\.\d{3}Z$/, "Z");
}

/** The URI value of URL: no escaping of , or ; (it is not TEXT), but never a line break. */
function uriValue(value: string): string {
  return value.replace(/[\u0000-\u001f\u007f]/g, "");
}

export function buildCalendar(calendar: Calendar): string {
  const lines: string[] = [
    "BEGIN:VCALENDAR",
    "VERSION:2.0",
    `PRODID:${PRODID}`,
    "CALSCALE:GREGORIAN",
    ...(calendar.method ? [`METHOD:${calendar.method}`] : []),
    `X-WR-CALNAME:${escapeText(calendar.name)}`,
  ];
  for (const event of calendar.events) {
    lines.push(
      "BEGIN:VEVENT",
      `UID:${escapeText(event.uid)}`,
      `DTSTAMP:${utcStamp(event.stamp)}`,
      `LAST-MODIFIED:${utcStamp(event.stamp)}`,
      `DTSTART;VALUE=DATE:${dateValue(event.startDay)}`,
      `DTEND;VALUE=DATE:${dateValue(nextDay(event.lastDay))}`,
      `SUMMARY:${escapeText(event.summary)}`,
      ...(event.description ? [`DESCRIPTION:${escapeText(event.description)}`] : []),
      ...(event.location ? [`LOCATION:${escapeText(event.location)}`] : []),
      ...(event.url ? [`URL:${uriValue(event.url)}`] : []),
      `STATUS:${event.status ?? "CONFIRMED"}`,
      `SEQUENCE:${event.sequence ?? 0}`,
      // All-day permit days should not block anyone's time as busy.
      "TRANSP:TRANSPARENT",
      "END:VEVENT",
    );
  }
  lines.push("END:VCALENDAR");
  return lines.map(foldLine).join("\r\n") + "\r\n";
}

export type PermitForCalendar = {
  id: string;
  number: string;
  title: string;
  validFrom: string;
  validTo: string;
  room?: string | null;
  state: "active" | "expired" | "revoked";
  /** Changes when the permit changes (revocation), so calendars pick up the new version. */
  updatedAt: Date;
  version?: number;
};

/**
 * Two events per permit: the validity window (first to last valid day) and the last valid day
 * itself, so the end stands out in a month view. A revoked permit's events are CANCELLED.
 */
export function permitEvents(permit: PermitForCalendar, options: { appUrl: string; domain: string }): CalendarEvent[] {
  const url = new URL(`/permits/${permit.id}`, options.appUrl).toString();
  const status = permit.state === "revoked" ? "CANCELLED" : "CONFIRMED";
  const title = permit.title || "Untitled application";
  const common = {
    location: permit.room ?? undefined,
    url,
    status,
    stamp: permit.updatedAt,
    sequence: Math.max(0, (permit.version ?? 1) - 1),
  } as const;
  return [
    {
      ...common,
      uid: `permit-${permit.id}-window@${options.domain}`,
      startDay: permit.validFrom,
      lastDay: permit.validTo,
      summary: `Permit ${permit.number} valid: ${title}`,
      description: `Permit ${permit.number} for "${title}" is valid from ${permit.validFrom} to ${permit.validTo} (inclusive).${
        permit.state === "revoked" ? " This permit was revoked." : ""
      }\n${url}`,
    },
    {
      ...common,
      uid: `permit-${permit.id}-last-day@${options.domain}`,
      startDay: permit.validTo,
      lastDay: permit.validTo,
      summary: `Last valid day of permit ${permit.number}: ${title}`,
      description: `Permit ${permit.number} expires at the end of ${permit.validTo}. Renew it before then if the set-up keeps running.\n${url}`,
    },
  ];
}
