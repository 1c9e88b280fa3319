// POST /api/training/records/[id]/certificate — a safety officer or admin uploads the certificate of a
// record (multipart/form-data, field "file"), with the uploads' checks: JPEG, PNG, WebP or PDF read
// from the content, at most 10 MB. GET … — the file, for the person it belongs to and for officers.
import { ATTACHMENT_MAX_BYTES, ATTACHMENT_REQUEST_MAX_BYTES, formatBytes } from "@/lib/applications/limits";
import { getStorage } from "@/lib/storage";
import { notFound } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { fileResponse, fileTooLarge, readUploadedFile } from "@/lib/http/upload";
import { assertCanAttachCertificate, attachCertificate } from "@/lib/training/actions";
import { certificateFor } from "@/lib/training/queries";

export const POST = route(
  {
    ids: { id: "That training record" },
    access: "training.record",
    rawBody: {
      maxBytes: ATTACHMENT_REQUEST_MAX_BYTES,
      tooLarge: () => fileTooLarge(`Each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`),
    },
  },
  async ({ request, readRawBody, user, params }) => {
    await assertCanAttachCertificate(user, params.id);
    const file = await readUploadedFile(request, readRawBody, {
      maxBytes: ATTACHMENT_MAX_BYTES,
      message: (size) =>
        `The file is ${formatBytes(size)}; each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`,
    });
    const record = await attachCertificate(user, params.id, file);
    return Response.json({ record }, { status: 201 });
  },
);

export const GET = route({ ids: { id: "That training record" }, access: "user" }, async ({ user, params }) => {
  const file = await certificateFor(user, params.id);
  const bytes = await (await getStorage()).get(file.key);
  if (!bytes) throw notFound("That certificate");
  return fileResponse({ bytes, contentType: file.contentType, filename: file.filename });
});
