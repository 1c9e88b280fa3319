// POST /api/applications/[id]/attachments — uploads one photo or schematic to the applicant's draft
// (multipart/form-data, field "file"). The type is read from the content: JPEG, PNG, WebP or PDF
// only; at most 10 MB each and 10 per application (413/422 with the reason).
import { addAttachment, assertCanAttach } from "@/lib/applications/attachments";
import { ATTACHMENT_MAX_BYTES, ATTACHMENT_REQUEST_MAX_BYTES, formatBytes } from "@/lib/applications/limits";
import { route } from "@/lib/http/route";
import { fileTooLarge, readUploadedFile } from "@/lib/http/upload";

// After the record check, the body is read through the bounded reader (readRawBody, lib/http/body.ts):
// counted as it streams and cut at one file's limit plus multipart framing, Content-Length or not,
// chunked or not. Only then is the form parsed, from those bytes (lib/http/upload.ts).
export const POST = route(
  {
    ids: { id: "That application" },
    access: "application.create",
    rawBody: {
      maxBytes: ATTACHMENT_REQUEST_MAX_BYTES,
      tooLarge: () =>
        fileTooLarge(
          `The file is larger than ${formatBytes(ATTACHMENT_MAX_BYTES)}; each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`,
        ),
    },
  },
  async ({ request, readRawBody, user, params }) => {
    await assertCanAttach(user, params.id);
    const file = await readUploadedFile(request, readRawBody, {
      maxBytes: ATTACHMENT_MAX_BYTES,
      message: (size) =>
        `The file is ${formatBytes(size)}; each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`,
    });
    const attachment = await addAttachment(user, params.id, file);
    return Response.json({ attachment }, { status: 201 });
  },
);
