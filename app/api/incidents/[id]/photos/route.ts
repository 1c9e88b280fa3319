// POST /api/incidents/[id]/photos — the reporter (until the report is closed) or a safety officer adds
// a photo (multipart/form-data, field "file"): the attachment rules — JPEG, PNG, WebP or PDF read from
// the content, at most 10 MB each and 10 per report.
import { ATTACHMENT_MAX_BYTES, ATTACHMENT_REQUEST_MAX_BYTES, formatBytes } from "@/lib/applications/limits";
import { route } from "@/lib/http/route";
import { fileTooLarge, readUploadedFile } from "@/lib/http/upload";
import { addIncidentPhoto, assertCanAddPhoto } from "@/lib/incidents/actions";

const each = `each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}`;

export const POST = route(
  {
    ids: { id: "That report" },
    access: "incident.report",
    rawBody: {
      maxBytes: ATTACHMENT_REQUEST_MAX_BYTES,
      tooLarge: () => fileTooLarge(`The file is larger than ${formatBytes(ATTACHMENT_MAX_BYTES)}; ${each}.`),
    },
  },
  async ({ request, readRawBody, user, params }) => {
    await assertCanAddPhoto(user, params.id);
    const file = await readUploadedFile(request, readRawBody, {
      maxBytes: ATTACHMENT_MAX_BYTES,
      message: (size) => `The file is ${formatBytes(size)}; ${each}.`,
    });
    return Response.json({ photo: await addIncidentPhoto(user, params.id, file) }, { status: 201 });
  },
);
