// GET /api/apparatus/[id]/inspections — the apparatus's inspection and maintenance records, its
// interval, next due day and retirement, for anyone who reads the apparatus.
// POST /api/apparatus/[id]/inspections — records one (owner, department with apparatus.write,
// safety officers): what was checked, the day, the person, the result and a note.
import { route } from "@/lib/http/route";
import { recordInspection } from "@/lib/upkeep/actions";
import { getUpkeep } from "@/lib/upkeep/queries";
import { inspectionSchema } from "@/lib/upkeep/schemas";

export const GET = route({ ids: { id: "That apparatus" }, access: "apparatus.read" }, async ({ user, params }) =>
  getUpkeep(user, params.id),
);

export const POST = route(
  { ids: { id: "That apparatus" }, access: "apparatus.read", body: inspectionSchema },
  async ({ user, params, body }) =>
    Response.json({ inspection: await recordInspection(user, params.id, body) }, { status: 201 }),
);
