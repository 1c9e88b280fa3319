// GET /api/incidents/[id]/photos/[photoId] — a report's photo, for anyone who may read the report:
// its real type, nosniff, images inline (?download=1 for a download).
import { route } from "@/lib/http/route";
import { fileResponse } from "@/lib/http/upload";
import { readIncidentPhoto } from "@/lib/incidents/actions";

export const GET = route(
  { ids: { id: "That report", photoId: "That photo" }, access: "incident.report" },
  async ({ request, user, params }) => {
    const file = await readIncidentPhoto(user, params.id, params.photoId);
    return fileResponse(file, new URL(request.url).searchParams.get("download") === "1");
  },
);
