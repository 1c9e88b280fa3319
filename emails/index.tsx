import { renderToStaticMarkup } from "./render";
import type { MailMessage } from "@/lib/outbox";
import { apparatusChangedEmail } from "./apparatus-changed";
import { applicationApprovedEmail } from "./application-approved";
import { applicationRecommendedEmail } from "./application-recommended";
import { applicationRejectedEmail } from "./application-rejected";
import { applicationReturnedEmail } from "./application-returned";
import { applicationSubmittedEmail } from "./application-submitted";
import { EmailDocument, textBody, type EmailContent } from "./components";
import type { EmailBuilder, EmailContext } from "./context";
import { incidentUpdateEmail } from "./incident-update";
import { inspectionDueEmail } from "./inspection-due";
import { invitationEmail } from "./invitation";
import { permitReminderEmail } from "./permit-reminder";
import { permitRevokedEmail } from "./permit-revoked";
import { trainingReminderEmail } from "./training-reminder";
import { preUseCheckFailedEmail } from "./pre-use-check-failed";

// Every e-mail kind → its body. The outbox worker calls renderEmail() when it sends a row, so a
// body change reaches mail that is still queued.

const BUILDERS: { [K in MailMessage["kind"]]: EmailBuilder<K> } = {
  invitation: invitationEmail,
  application_submitted: applicationSubmittedEmail,
  application_returned: applicationReturnedEmail,
  application_recommended: applicationRecommendedEmail,
  application_approved: applicationApprovedEmail,
  application_rejected: applicationRejectedEmail,
  permit_revoked: permitRevokedEmail,
  permit_reminder: permitReminderEmail,
  apparatus_changed: apparatusChangedEmail,
  training_reminder: trainingReminderEmail,
  pre_use_check_failed: preUseCheckFailedEmail,
  incident_update: incidentUpdateEmail,
  inspection_due: inspectionDueEmail,
};

export type RenderedEmail = { content: EmailContent; html: string; text: string };

export function emailContent(message: MailMessage, ctx: EmailContext): EmailContent {
  const build = BUILDERS[message.kind] as EmailBuilder<typeof message.kind>;
  return build(message.data as never, ctx);
}

export function renderEmail(message: MailMessage, ctx: EmailContext): RenderedEmail {
  const content = emailContent(message, ctx);
  const frame = { institutionName: ctx.institutionName, appUrl: ctx.appUrl };
  const html = "<!DOCTYPE html>" + renderToStaticMarkup(<EmailDocument content={content} frame={frame} />);
  return { content, html, text: textBody(content, frame) };
}

export type { EmailContext, RecipientRelation } from "./context";
