import "server-only";
import { mailOutbox } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";

// Every e-mail Arcwarden sends, as data. Callers queue a message in the same transaction as the
// event that causes it; the worker renders the body from `kind` and `data` and sends it. A
// `dedupeKey` makes a message unique: queuing it twice is a no-op.

export type MailMessage =
  | {
      kind: "invitation";
      data: { name: string; invitedBy: string; url: string; expiresAt: string };
    }
  | {
      kind: "application_submitted";
      data: {
        applicationId: string;
        title: string;
        applicantName: string;
        tier: number;
      };
    }
  | {
      kind: "application_returned";
      data: {
        applicationId: string;
        title: string;
        reviewerName: string;
        comment: string;
      };
    }
  | {
      kind: "application_recommended";
      data: {
        applicationId: string;
        title: string;
        reviewerName: string;
        tier: number;
      };
    }
  | {
      kind: "application_approved";
      data: {
        applicationId: string;
        permitId: string;
        permitNumber: string;
        title: string;
        validFrom: string;
        validTo: string;
      };
    }
  | {
      kind: "application_rejected";
      data: {
        applicationId: string;
        title: string;
        signerName: string;
        comment: string;
      };
    }
  | {
      kind: "permit_revoked";
      data: {
        permitId: string;
        permitNumber: string;
        title: string;
        reason: string;
        signerName: string;
      };
    }
  | {
      kind: "permit_reminder";
      data: {
        permitId: string;
        permitNumber: string;
        title: string;
        validTo: string;
        daysLeft: number;
      };
    };

export type MailKind = MailMessage["kind"];

export function defaultSubject(message: MailMessage): string {
  switch (message.kind) {
    case "invitation":
      return "You are invited to Arcwarden";
    case "application_submitted":
      return `Review requested: ${message.data.title} (tier ${message.data.tier})`;
    case "application_returned":
      return `Returned for changes: ${message.data.title}`;
    case "application_recommended":
      return `Recommended for approval: ${message.data.title} (tier ${message.data.tier})`;
    case "application_approved":
      return `Permit ${message.data.permitNumber} issued: ${message.data.title}`;
    case "application_rejected":
      return `Not approved: ${message.data.title}`;
    case "permit_revoked":
      return `Permit ${message.data.permitNumber} revoked`;
    case "permit_reminder":
      return message.data.daysLeft > 0
        ? `Permit ${message.data.permitNumber} ends in ${message.data.daysLeft} day${message.data.daysLeft === 1 ? "" : "s"}`
        : `Permit ${message.data.permitNumber} has expired`;
  }
}

/** Queues one message per recipient. Returns how many rows were queued (0 for a repeated dedupeKey). */
export async function queueMail(
  tx: DbOrTx,
  to: string | readonly string[],
  message: MailMessage,
  options: { dedupeKey?: string } = {},
): Promise<number> {
  const recipients = [...new Set(typeof to === "string" ? [to] : to)].filter(Boolean);
  if (recipients.length === 0) return 0;
  const rows = await tx
    .insert(mailOutbox)
    .values(
      recipients.map((address) => ({
        kind: message.kind,
        toAddress: address,
        subject: defaultSubject(message),
        data: message.data as Record<string, unknown>,
        dedupeKey: options.dedupeKey ? `${options.dedupeKey}:${address.toLowerCase()}` : null,
      })),
    )
    .onConflictDoNothing({ target: mailOutbox.dedupeKey })
    .returning({ id: mailOutbox.id });
  return rows.length;
}
