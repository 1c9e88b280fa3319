import "server-only";
import MailComposer from "nodemailer/lib/mail-composer";
import type Mail from "nodemailer/lib/mailer";
import { renderEmail, type RecipientRelation } from "@/emails";
import type { OutboxMail } from "@/db/schema";
import { buildCalendar, permitEvents } from "@/lib/calendar/ics";
import { env } from "@/lib/env";
import { invitationToken, invitationUrl } from "@/lib/users/invitation-token";
import { headerText, isPlainAddress, outboxMessageId, senderDomain } from "@/lib/outbox/headers";
import type { MailMessage } from "@/lib/outbox";
import { permitPdfAttachment } from "./permit-pdf";
import { applicationDepartmentName, institution, permitMailFacts, type PermitMailFacts } from "./queries";

// Turns one outbox row into the exact bytes sent over SMTP: the body rendered from its kind and data
// (emails/), an HTML and a plain-text part, a stable Message-ID, and attachments — on approval the
// permit PDF and an .ics file with the validity window.

export class UnsendableMailError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "UnsendableMailError";
  }
}

export type ComposedMail = {
  raw: Buffer;
  messageId: string;
  envelope: { from: string; to: string };
  attachments: string[];
};

function fromAddress(mailFrom: string): string {
  const match = /<([^<>]+)>\s*$/.exec(mailFrom.trim());
  return (match ? match[1] : mailFrom).trim();
}

function relationTo(facts: PermitMailFacts | null, address: string): RecipientRelation {
  if (!facts) return null;
  return facts.holderEmail.toLowerCase() === address.toLowerCase() ? "holder" : "operator";
}

export async function composeOutboxMail(row: OutboxMail): Promise<ComposedMail> {
  const config = env();
  if (!isPlainAddress(row.toAddress)) {
    throw new UnsendableMailError(`refused recipient address ${JSON.stringify(row.toAddress.slice(0, 80))}`);
  }
  const from = fromAddress(config.MAIL_FROM);
  if (!isPlainAddress(from)) throw new UnsendableMailError("MAIL_FROM does not contain a plain address");

  const message = { kind: row.kind, data: row.data } as MailMessage;
  const permitId =
    message.kind === "application_approved" || message.kind === "permit_revoked" || message.kind === "permit_reminder"
      ? message.data.permitId
      : null;
  const [inst, facts] = await Promise.all([
    institution(),
    permitId ? permitMailFacts(permitId) : Promise.resolve(null),
  ]);

  // The approval mail prints what the permit says, read from the permit itself.
  if (message.kind === "application_approved" && facts) {
    message.data = {
      ...message.data,
      tier: message.data.tier ?? facts.tier,
      room: message.data.room ?? facts.room ?? undefined,
      conditions: message.data.conditions ?? facts.conditions,
    };
  }

  if (message.kind === "invitation" && !message.data.url) {
    if (!message.data.invitationId) throw new UnsendableMailError("invitation mail without its invitation");
    message.data = { ...message.data, url: invitationUrl(invitationToken(message.data.invitationId)) };
  }

  if (message.kind === "application_submitted" && !message.data.departmentName) {
    const departmentName = await applicationDepartmentName(message.data.applicationId);
    if (departmentName) message.data = { ...message.data, departmentName };
  }

  const rendered = renderEmail(message, {
    appUrl: config.APP_URL,
    institutionName: inst.name,
    timeZone: inst.timeZone,
    recipient: { address: row.toAddress, relation: relationTo(facts, row.toAddress) },
  });

  const attachments: Mail.Attachment[] = [];
  if (message.kind === "application_approved") {
    const permit = facts ?? null;
    const ics = buildCalendar({
      name: `Permit ${message.data.permitNumber}`,
      method: "PUBLISH",
      events: permitEvents(
        {
          id: message.data.permitId,
          number: message.data.permitNumber,
          title: message.data.title,
          validFrom: message.data.validFrom,
          validTo: message.data.validTo,
          room: permit?.room ?? null,
          state: "active",
          updatedAt: row.createdAt,
        },
        { appUrl: config.APP_URL, domain: senderDomain(config.MAIL_FROM) },
      ),
    });
    attachments.push({
      filename: `${message.data.permitNumber}.ics`,
      content: ics,
      contentType: "text/calendar; charset=utf-8; method=PUBLISH",
    });
    const pdf = await permitPdfAttachment(message.data.permitId);
    if (pdf) attachments.push({ filename: pdf.filename, content: pdf.bytes, contentType: "application/pdf" });
  }

  const messageId = outboxMessageId(row, senderDomain(config.MAIL_FROM));
  const composer = new MailComposer({
    from: config.MAIL_FROM,
    to: row.toAddress,
    subject: headerText(row.subject),
    messageId,
    date: row.createdAt,
    text: rendered.text,
    html: rendered.html,
    attachments,
    headers: {
      // Machine-sent notifications: no vacation auto-replies back to us (RFC 3834).
      "Auto-Submitted": "auto-generated",
      "X-Benchclear-Kind": row.kind,
    },
  });
  const raw = await new Promise<Buffer>((resolve, reject) =>
    composer.compile().build((error, buffer) => (error ? reject(error) : resolve(buffer))),
  );
  return {
    raw,
    messageId,
    envelope: { from, to: row.toAddress },
    attachments: attachments.map((a) => String(a.filename)),
  };
}
