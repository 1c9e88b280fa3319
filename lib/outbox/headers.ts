// Header hygiene for outgoing mail. Subjects and display names carry text people typed (titles,
// names); a CR or LF in them must never start a new header line. nodemailer encodes header values
// too, but we do not rely on one layer: text is flattened to one line here before it reaches the
// composer, and recipient addresses that are not plain addresses are refused outright.

// C0 and C1 control characters, DEL, and the Unicode line and paragraph separators.
const CONTROL = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]+/g;

/** Header text on one line: control characters become a space, runs of spaces collapse. */
export function headerText(value: string, maxLength = 200): string {
  const flat = value.replace(CONTROL, " ").replace(/\s+/g, " ").trim();
  return flat.length > maxLength ? `${flat.slice(0, maxLength - 1).trimEnd()}…` : flat;
}

// A deliberately plain address: no display name, comments, quotes, angle brackets or spaces. The
// outbox stores bare addresses (users' and invitees' e-mails, already validated where they entered).
const ADDRESS =
  /^[A-Za-z0-9.!#$%&'*+/=?^_`{|}~-]+@[A-Za-z0-9](?:[A-Za-z0-9-]{0,61}[A-Za-z0-9])?(?:\.[A-Za-z0-9](?:[A-Za-z0-9-]{0,61}[A-Za-z0-9])?)+$/;

export function isPlainAddress(value: string): boolean {
  return value.length <= 254 && ADDRESS.test(value);
}

/** The domain part of MAIL_FROM ("Benchclear <no-reply@benchclear.test>" → "benchclear.test"). */
export function senderDomain(mailFrom: string): string {
  const match = /@([A-Za-z0-9.-]+)>?\s*$/.exec(mailFrom.trim());
  return match ? match[1].toLowerCase() : "benchclear.invalid";
}

/**
 * The Message-ID of an outbox row: the same on every attempt, so a mail sent twice is recognisably
 * the same message; the row's creation time keeps ids unique across database resets (ids restart).
 */
export function outboxMessageId(row: { id: number; createdAt: Date }, domain: string): string {
  return `<bc.${row.id}.${row.createdAt.getTime().toString(36)}@${domain}>`;
}
