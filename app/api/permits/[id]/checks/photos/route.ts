// POST /api/permits/[id]/checks/photos — one photo for a pre-use check about to be sent
// (multipart/form-data, field "file"): JPEG, PNG or WebP read from the content, at most 10 MB. Answers
// the photo's id, which the check then names. Same people as for recording the check.
import { z } from "zod";
import { addCheckPhoto, assertCanAddCheckPhoto } from "@/lib/checks/actions";
import { ATTACHMENT_MAX_BYTES, ATTACHMENT_REQUEST_MAX_BYTES, formatBytes } from "@/lib/applications/limits";
import { AppError, fromZodError } from "@/lib/errors";
import { route } from "@/lib/http/route";

const uploadSchema = z.object({
  file: z.instanceof(File, { error: "Choose a photo to upload (form field “file”)." }),
});

const tooLarge = () => {
  const what = `The photo is larger than ${formatBytes(ATTACHMENT_MAX_BYTES)}; each may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`;
  return new AppError("payload_too_large", `file: ${what}`, { issues: [{ path: "file", message: what }] });
};

export const POST = route(
  {
    ids: { id: "That permit" },
    access: "permit.check",
    rawBody: { maxBytes: ATTACHMENT_REQUEST_MAX_BYTES, tooLarge },
  },
  async ({ request, readRawBody, user, params }) => {
    await assertCanAddCheckPhoto(user, params.id);
    const type = request.headers.get("content-type") ?? "";
    if (!/^multipart\/form-data\b/i.test(type)) {
      throw new AppError("unsupported_media_type", "Send the photo as multipart/form-data in the field “file”.");
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
    if (parsed.data.file.size > ATTACHMENT_MAX_BYTES) throw tooLarge();
    const photo = await addCheckPhoto(user, params.id, Buffer.from(await parsed.data.file.arrayBuffer()));
    return Response.json({ photo }, { status: 201 });
  },
);
