// POST /api/training/records/[id]/certificate — a safety officer or admin uploads the certificate of a
// record (multipart/form-data, field "file"), with the uploads' checks: JPEG, PNG, WebP or PDF read
// from the content, at most 10 MB. GET … — the file, for the person it belongs to and for officers.
import { z } from "zod";
import {
  ATTACHMENT_MAX_BYTES,
  ATTACHMENT_REQUEST_MAX_BYTES,
  formatBytes,
  isImageType,
} from "@/lib/applications/limits";
import { getStorage } from "@/lib/storage";
import { AppError, fromZodError, notFound } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { assertCanAttachCertificate, attachCertificate } from "@/lib/training/actions";
import { certificateFor } from "@/lib/training/queries";

const uploadSchema = z.object({
  file: z.instanceof(File, { error: "Choose a file to upload (form field “file”)." }),
});

const tooLarge = (what: string) =>
  new AppError("payload_too_large", `file: ${what}`, { issues: [{ path: "file", message: what }] });

export const POST = route(
  {
    ids: { id: "That training record" },
    access: "training.record",
    rawBody: {
      maxBytes: ATTACHMENT_REQUEST_MAX_BYTES,
      tooLarge: () => tooLarge(`Each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`),
    },
  },
  async ({ request, readRawBody, user, params }) => {
    await assertCanAttachCertificate(user, params.id);
    const type = request.headers.get("content-type") ?? "";
    if (!/^multipart\/form-data\b/i.test(type)) {
      throw new AppError("unsupported_media_type", "Send the file as multipart/form-data in the field “file”.");
    }
    const raw = await readRawBody();
    let form: FormData;
    try {
      form = await new Response(new Uint8Array(raw), { headers: { "content-type": type } }).formData();
    } catch {
      throw new AppError("bad_request", "The upload could not be read (it may have been cut short). Try again.");
    }
    const parsed = uploadSchema.safeParse({ file: form.get("file") });
    if (!parsed.success) throw fromZodError(parsed.error);
    const file = parsed.data.file;
    if (file.size > ATTACHMENT_MAX_BYTES) {
      throw tooLarge(
        `The file is ${formatBytes(file.size)}; each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`,
      );
    }
    const record = await attachCertificate(user, params.id, {
      name: file.name,
      bytes: Buffer.from(await file.arrayBuffer()),
    });
    return Response.json({ record }, { status: 201 });
  },
);

function contentDisposition(kind: "inline" | "attachment", filename: string): string {
  const ascii = filename.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
  return `${kind}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(filename)}`;
}

export const GET = route({ ids: { id: "That training record" }, access: "user" }, async ({ user, params }) => {
  const file = await certificateFor(user, params.id);
  const bytes = await (await getStorage()).get(file.key);
  if (!bytes) throw notFound("That certificate");
  return new Response(new Uint8Array(bytes), {
    headers: {
      "Content-Type": file.contentType,
      "Content-Length": String(bytes.length),
      "Content-Disposition": contentDisposition(isImageType(file.contentType) ? "inline" : "attachment", file.filename),
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
});
