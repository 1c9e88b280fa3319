import "server-only";
import type { DbOrTx } from "@/lib/audit";
import { env } from "@/lib/env";
import { queueMail } from "./outbox";

// Queues the invitation e-mail in the outbox, in the caller's transaction. Outside production (or
// with LOG_INVITATION_LINKS) the link is also written to the server log, so a developer can follow
// it without reading mail.
export async function queueInvitationMail(
  tx: DbOrTx,
  mail: { to: string; name: string; invitedBy: string; url: string; expiresAt: Date },
): Promise<void> {
  await queueMail(tx, mail.to, {
    kind: "invitation",
    data: { name: mail.name, invitedBy: mail.invitedBy, url: mail.url, expiresAt: mail.expiresAt.toISOString() },
  });
  if (process.env.NODE_ENV !== "production" || env().LOG_INVITATION_LINKS) {
    console.log(`[invitation] ${mail.to}: ${mail.url}`);
  }
}
