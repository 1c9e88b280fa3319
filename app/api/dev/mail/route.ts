// GET /api/dev/mail — admins: the messages the local inbox received (newest first) and the
// outbox's queued and failed rows. Answers 404 unless MAIL_TRANSPORT=local-inbox (never in a deployment
// that sends real mail).
import { inboxEnabled, listCaught } from "@/lib/mail/local-inbox";
import { listOutbox, outboxCounts } from "@/lib/mail/queries";
import { notFound } from "@/lib/errors";
import { route } from "@/lib/http/route";

export const GET = route({ access: "dev.mail" }, async () => {
  if (!inboxEnabled()) throw notFound("The local inbox");
  const [messages, counts, pending] = await Promise.all([
    listCaught(),
    outboxCounts(),
    listOutbox({ statuses: ["queued", "failed"], limit: 100 }),
  ]);
  return { messages, outbox: { counts, pending } };
});
