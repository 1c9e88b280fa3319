import "server-only";
import { mailOutbox } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { headerText } from "./headers";

// Every e-mail Benchclear sends, as data. Callers queue a message in the same transaction as the
// event that causes it; the outbox worker (lib/mail/actions.ts, run by lib/jobs/worker.ts) renders
// the body from `kind` and `data` (emails/*.tsx) and sends it. A `dedupeKey` makes a message unique
// per recipient (mail_outbox.dedupe_key is UNIQUE): queuing it twice is a no-op.

export type MailMessage =
  | {
      kind: "invitation";
      // Queued with the invitation's id; the link (`url`) is rebuilt from it at render time
      // (lib/mail/compose.ts) and never stored. A row queued with a ready `url` has it dropped once
      // the message is accepted (lib/mail/actions.ts).
      data: { name: string; invitedBy: string; invitationId?: string; url?: string; expiresAt: string };
    }
  | {
      kind: "application_submitted";
      data: { applicationId: string; title: string; applicantName: string; tier: number; departmentName?: string };
    }
  | {
      kind: "application_returned";
      data: { applicationId: string; title: string; reviewerName: string; comment: string; pinnedTo?: string | null };
    }
  | {
      kind: "application_recommended";
      data: { applicationId: string; title: string; reviewerName: string; tier: number };
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
        tier?: number;
        room?: string;
        conditions?: string[];
        signerName?: string;
      };
    }
  | {
      kind: "application_rejected";
      data: { applicationId: string; title: string; signerName: string; comment: string };
    }
  | {
      kind: "permit_revoked";
      data: {
        permitId: string;
        permitNumber: string;
        title: string;
        reason: string;
        signerName: string;
        revokedAt?: string;
      };
    }
  | {
      kind: "permit_reminder";
      data: {
        permitId: string;
        permitNumber: string;
        title: string;
        validTo: string;
        /** Days until the permit expires (the end of validTo): 1 on its last valid day, 0 once expired. */
        daysLeft: number;
        /** Why this recipient gets it: the holder, or the reviewer who signed (on expiry). */
        recipient?: "holder" | "reviewer";
        holderName?: string;
      };
    }
  | {
      // An apparatus was saved as a new revision while active permits cover it (lib/rereview).
      kind: "apparatus_changed";
      data: {
        apparatusId: string;
        apparatusName: string;
        revision: number;
        changedByName: string;
        /** Why this recipient gets it: they hold one of the permits, or they are a safety officer. */
        recipient: "holder" | "officer";
        permits: {
          permitId: string;
          permitNumber: string;
          title: string;
          permitTier: number;
          tier: number;
          /** What changed since the permit's approval, "label: before → after" with units (first rows). */
          changes: string[];
        }[];
      };
    }
  | {
      // A course of a person's training lapses soon (lib/training/reminders.ts).
      kind: "training_reminder";
      data: {
        personName: string;
        course: string;
        /** The day the course lapses (it counts through the day before). */
        lapsesOn: string;
        daysLeft: number;
        recipient: "person" | "officer";
      };
    }
  | {
      // A pre-use check with an item answered "no" (lib/checks), to the holder and the safety officers.
      kind: "pre_use_check_failed";
      data: {
        permitId: string;
        permitNumber: string;
        title: string;
        checkId: string;
        recordedByName: string;
        /** ISO 8601, UTC. */
        checkedAt: string;
        failed: { text: string; note: string }[];
        note: string;
        recipient?: "holder" | "officer";
      };
    }
  | {
      // An incident or near-miss report moved a step (lib/incidents/actions.ts): to its reporter and
      // the safety officers, once per step (dedupe key incident:<id>:<step>:v<version>).
      kind: "incident_update";
      data: {
        incidentId: string;
        ref: string;
        summary: string;
        incidentKind: "incident" | "near_miss";
        step: IncidentStep;
        state: "open" | "investigating" | "closed";
        actorName: string;
        occurredAt: string;
        location: string;
        injuries: boolean;
        findings?: string;
        actions?: string;
        permitNumber?: string | null;
        recipient: "reporter" | "officer";
      };
    }
  | InspectionDueMessage;

/** The owner of an apparatus: its next inspection is due (lib/upkeep, from the daily job). */
export type InspectionDueMessage = {
  kind: "inspection_due";
  data: {
    apparatusId: string;
    apparatusName: string;
    room: string;
    dueOn: string;
    lastInspectedOn: string | null;
    intervalDays: number;
  };
};

/** What happened to a report: each is one e-mail to the reporter and the officers. */
export type IncidentStep = "reported" | "investigating" | "closed" | "reopened" | "permit_revoked";

export type MailKind = MailMessage["kind"];

/** The subject line, flattened to one line (titles are user input: no CR/LF reaches a header). */
export function defaultSubject(message: MailMessage): string {
  return headerText(subjectFor(message));
}

function subjectFor(message: MailMessage): string {
  switch (message.kind) {
    case "invitation":
      return "You are invited to Benchclear";
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
      if (message.data.daysLeft <= 0) return `Permit ${message.data.permitNumber} has expired`;
      if (message.data.daysLeft === 1) return `Permit ${message.data.permitNumber}: last valid day today`;
      return `Permit ${message.data.permitNumber}: ${message.data.daysLeft} days left`;
    case "apparatus_changed": {
      const [first, ...rest] = message.data.permits;
      const under = rest.length ? `${rest.length + 1} active permits` : `permit ${first?.permitNumber ?? ""}`;
      return `Apparatus changed under ${under}: ${message.data.apparatusName}`;
    }
    case "training_reminder":
      return message.data.recipient === "person"
        ? `Your ${message.data.course} training lapses on ${message.data.lapsesOn}`
        : `${message.data.personName}: ${message.data.course} lapses on ${message.data.lapsesOn}`;
    case "pre_use_check_failed":
      return `Pre-use check failed: permit ${message.data.permitNumber}`;
    case "inspection_due":
      return `Inspection due: ${message.data.apparatusName}`;
    case "incident_update":
      return `${message.data.ref} ${INCIDENT_STEP_SUBJECTS[message.data.step]}: ${message.data.summary}`;
  }
}

const INCIDENT_STEP_SUBJECTS: Record<IncidentStep, string> = {
  reported: "reported",
  investigating: "under investigation",
  closed: "closed",
  reopened: "reopened",
  permit_revoked: "permit revoked",
};

/** Queues one message per recipient. Returns how many rows were queued (0 for a repeated dedupeKey). */
export async function queueMail(
  tx: DbOrTx,
  to: string | readonly string[],
  message: MailMessage,
  options: { dedupeKey?: string } = {},
): Promise<number> {
  // One row per mailbox: addresses differing only in case are the same recipient.
  const list = (typeof to === "string" ? [to] : to).map((a) => a.trim()).filter(Boolean);
  const recipients = [...new Map(list.map((a) => [a.toLowerCase(), a])).values()];
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
