// POST /api/applications/[id]/attachments — uploads one photo or schematic to the applicant's draft
// (multipart/form-data, field "file"). The type is read from the content: JPEG, PNG, WebP or PDF
// only; at most 10 MB each and 10 per application (413/422 with the reason).
import { z } from "zod";
import { addAttachment, assertCanAttach } from "@/lib/applications/attachments";
import { ATTACHMENT_MAX_BYTES, ATTACHMENT_REQUEST_MAX_BYTES, formatBytes } from "@/lib/applications/limits";
import { AppError, fromZodError } from "@/lib/errors";
import { route } from "@/lib/http/route";

const uploadSchema = z.object({
  file: z.instanceof(File, { error: "Choose a file to upload (form field “file”)." }),
});

const tooLarge = (what: string) =>
  new AppError("payload_too_large", `file: ${what}`, { issues: [{ path: "file", message: what }] });

// After the record check and the type check, the body is read through the bounded reader
// (readRawBody, lib/http/body.ts): counted as it streams and cut at one file's limit plus multipart
// framing, Content-Length or not, chunked or not. Only then is the form parsed, from those bytes.
export const POST = route(
  {
    ids: { id: "That application" },
    access: "application.create",
    rawBody: {
      maxBytes: ATTACHMENT_REQUEST_MAX_BYTES,
      tooLarge: () =>
        tooLarge(
          `The file is larger than ${formatBytes(ATTACHMENT_MAX_BYTES)}; each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`,
        ),
    },
  },
  async ({ request, readRawBody, user, params }) => {
    const id = params.id;
    await assertCanAttach(user, id);
    const type = request.headers.get("content-type") ?? "";
    if (!/^multipart\/form-data\b/i.test(type)) {
      throw new AppError("unsupported_media_type", "Send the file as multipart/form-data in the field “file”.");
    }
    const rawBody = await readRawBody();
    let form: FormData;
    try {
      form = await new Response(new Uint8Array(rawBody), {
        headers: { "content-type": request.headers.get("content-type") ?? "" },
      }).formData();
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
    const attachment = await addAttachment(user, id, { name: file.name, bytes: Buffer.from(await file.arrayBuffer()) });
    return Response.json({ attachment }, { status: 201 });
  },
);
