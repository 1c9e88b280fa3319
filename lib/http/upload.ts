import "server-only";
import { z } from "zod";
import { AppError, fromZodError } from "@/lib/errors";

// One file sent as multipart/form-data in the field "file", for upload routes that declared
// `rawBody` in route(): the body is read through the bounded reader (counted as it streams, cut at
// the route's limit), and only then parsed. The type and size rules are the caller's domain's.

const uploadSchema = z.object({
  file: z.instanceof(File, { error: "Choose a file to upload (form field “file”)." }),
});

/** 413 naming the field "file". */
export const fileTooLarge = (what: string) =>
  new AppError("payload_too_large", `file: ${what}`, { issues: [{ path: "file", message: what }] });

export async function readUploadedFile(
  request: Request,
  readRawBody: () => Promise<Buffer>,
  limit: { maxBytes: number; message: (size: number) => string },
): Promise<{ name: string; bytes: Buffer }> {
  const type = request.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data\b/i.test(type)) {
    throw new AppError("unsupported_media_type", "Send the file as multipart/form-data in the field “file”.");
  }
  const rawBody = await readRawBody();
  let form: FormData;
  try {
    form = await new Response(new Uint8Array(rawBody), { headers: { "content-type": type } }).formData();
  } catch {
    throw new AppError("bad_request", "The upload could not be read (it may have been cut short). Try again.");
  }
  const parsed = uploadSchema.safeParse({ file: form.get("file") });
  if (!parsed.success) throw fromZodError(parsed.error);
  const file = parsed.data.file;
  if (file.size > limit.maxBytes) throw fileTooLarge(limit.message(file.size));
  return { name: file.name, bytes: Buffer.from(await file.arrayBuffer()) };
}

/** RFC 6266 with an ASCII fallback and the UTF-8 name (RFC 5987). */
export function contentDisposition(kind: "inline" | "attachment", filename: string): string {
  const ascii = filename.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
  return `${kind}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(filename)}`;
}

/** A stored file as the answer: its real type, nosniff, images inline, anything else a download. */
export function fileResponse(file: { bytes: Buffer; contentType: string; filename: string }, download = false) {
  const inline = file.contentType.startsWith("image/") && !download;
  return new Response(new Uint8Array(file.bytes), {
    headers: {
      "Content-Type": file.contentType,
      "Content-Length": String(file.bytes.length),
      "Content-Disposition": contentDisposition(inline ? "inline" : "attachment", file.filename),
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
}
