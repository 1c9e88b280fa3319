// GET /api/dev/mail — admins: the messages the local mail catcher received (newest first) and the
// outbox's queued and failed rows. Answers 404 unless MAIL_TRANSPORT=catcher (never in a deployment
// that sends real mail).
import { catcherEnabled, listCaught } from "@/lib/mail/catcher";
import { listOutbox, outboxCounts } from "@/lib/mail/queries";
import { notFound } from "@/lib/http/errors";
import { route } from "@/lib/http/route";

export const GET = route({ access: "dev.mail" }, async () => {
  if (!catcherEnabled()) throw notFound("The mail catcher");
  const [messages, counts, pending] = await Promise.all([
    listCaught(),
    outboxCounts(),
    listOutbox({ statuses: ["queued", "failed"], limit: 100 }),
  ]);
  return { messages, outbox: { counts, pending } };
});
