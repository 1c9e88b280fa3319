// GET /api/permits/[id]/checks/photos/[photoId] — a pre-use check's photo, for anyone who may see the
// permit: its real type, inline, nosniff, never cached by shared caches.
import { readCheckPhoto } from "@/lib/checks/actions";
import { route } from "@/lib/http/route";

export const GET = route(
  { ids: { id: "That permit", photoId: "That photo" }, access: "user" },
  async ({ user, params }) => {
    const photo = await readCheckPhoto(user, params.id, params.photoId);
    return new Response(new Uint8Array(photo.bytes), {
      headers: {
        "Content-Type": photo.contentType,
        "Content-Length": String(photo.bytes.length),
        "Content-Disposition": "inline",
        "X-Content-Type-Options": "nosniff",
        "Cache-Control": "private, no-store",
      },
    });
  },
);
