// POST /api/permits/[id]/amend — the holder of an active permit whose apparatus changed since approval
// starts an amendment: a new draft pre-filled from the permit with the apparatus's current revision,
// linked to the permit (lib/rereview/amend.ts). Answers the draft's id and where to edit it.
import { z } from "zod";
import { route } from "@/lib/http/route";
import { amendPermit } from "@/lib/rereview/amend";

// The request carries no fields; an empty JSON object keeps the JSON content-type rule of route().
const bodySchema = z.object({}).strict().optional();

export const POST = route(
  { access: "application.create", body: bodySchema, ids: { id: "That permit" } },
  async ({ user, params }) => {
    const { application } = await amendPermit(user, params.id);
    return Response.json({ application, editUrl: `/applications/${application.id}/edit` }, { status: 201 });
  },
);
