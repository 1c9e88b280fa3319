// GET /api/dev/mail/[id] — admins: one caught message with its headers, HTML and text parts and its
// attachments' names and sizes. 404 unless MAIL_TRANSPORT=local-inbox, or when there is no such message.
import { inboxEnabled, getCaught } from "@/lib/mail/local-inbox";
import { notFound } from "@/lib/errors";
import { route } from "@/lib/http/route";

export const GET = route({ access: "dev.mail" }, async ({ params }) => {
  if (!inboxEnabled()) throw notFound("The local inbox");
  const message = await getCaught(params.id ?? "");
  if (!message) throw notFound("That message");
  return {
    ...message,
    attachments: message.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, size: a.size })),
  };
});
