// GET /api/applications/[id]/attachments/[attachmentId] — the file, for anyone who may read the
// application: its real type, nosniff, images inline (?download=1 for a download), PDFs as a download.
// DELETE … — the applicant takes a file off the draft (kept while a submitted revision lists it).
import { readAttachment, removeAttachment } from "@/lib/applications/attachments";
import { route } from "@/lib/http/route";
import { fileResponse } from "@/lib/http/upload";

export const GET = route(
  { ids: { id: "That application", attachmentId: "That attachment" }, access: "user" },
  async ({ request, user, params }) => {
    const file = await readAttachment(user, params.id, params.attachmentId);
    const download = new URL(request.url).searchParams.get("download") === "1";
    return fileResponse(file, download);
  },
);

export const DELETE = route(
  { ids: { id: "That application", attachmentId: "That attachment" }, access: "application.create" },
  async ({ user, params }) => ({
    attachment: await removeAttachment(user, params.id, params.attachmentId),
  }),
);
