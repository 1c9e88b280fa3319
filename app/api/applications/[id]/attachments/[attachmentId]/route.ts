// GET /api/applications/[id]/attachments/[attachmentId] — the file, for anyone who may read the
// application: its real type, nosniff, images inline (?download=1 for a download), PDFs as a download.
// DELETE … — the applicant takes a file off the draft (kept while a submitted revision lists it).
import { readAttachment, removeAttachment } from "@/lib/applications/attachments";
import { isImageType } from "@/lib/applications/limits";
import { route } from "@/lib/http/route";

/** RFC 6266 with an ASCII fallback and the UTF-8 name (RFC 5987). */
function contentDisposition(kind: "inline" | "attachment", filename: string): string {
  const ascii = filename.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
  return `${kind}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(filename)}`;
}

export const GET = route(
  { ids: { id: "That application", attachmentId: "That attachment" }, access: "user" },
  async ({ request, user, params }) => {
    const file = await readAttachment(user, params.id, params.attachmentId);
    const download = new URL(request.url).searchParams.get("download") === "1";
    const inline = isImageType(file.contentType) && !download;
    return new Response(new Uint8Array(file.bytes), {
      headers: {
        "Content-Type": file.contentType,
        "Content-Length": String(file.bytes.length),
        "Content-Disposition": contentDisposition(inline ? "inline" : "attachment", file.filename),
        "X-Content-Type-Options": "nosniff",
        "Cache-Control": "private, no-store",
      },
    });
  },
);

export const DELETE = route(
  { ids: { id: "That application", attachmentId: "That attachment" }, access: "application.create" },
  async ({ user, params }) => ({
    attachment: await removeAttachment(user, params.id, params.attachmentId),
  }),
);
