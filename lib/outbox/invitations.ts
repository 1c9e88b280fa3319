import "server-only";
import type { DbOrTx } from "@/lib/audit";
import { env } from "@/lib/env";
import { invitationToken, invitationUrl } from "@/lib/users/invitation-token";
import { queueMail } from "./index";

// Queues the invitation e-mail in the outbox, in the caller's transaction. The row keeps the
// invitation's id, never the link: the link's token is rebuilt from the id with a key from the
// environment when the mail is rendered (lib/users/invitation-token.ts), so no secret sits in
// mail_outbox.data. Outside production (or with LOG_INVITATION_LINKS) the link is also written to the
// server log, so a developer can follow it without reading mail.
export async function queueInvitationMail(
  tx: DbOrTx,
  mail: { to: string; name: string; invitedBy: string; invitationId: string; expiresAt: Date },
): Promise<void> {
  await queueMail(tx, mail.to, {
    kind: "invitation",
    data: {
      name: mail.name,
      invitedBy: mail.invitedBy,
      invitationId: mail.invitationId,
      expiresAt: mail.expiresAt.toISOString(),
    },
  });
  if (process.env.NODE_ENV !== "production" || env().LOG_INVITATION_LINKS) {
    console.log(`[invitation] ${mail.to}: ${invitationUrl(invitationToken(mail.invitationId))}`);
  }
}
