// POST /api/permits/[id]/renew — the holder starts a renewal: a new draft prefilled from the permit's
// application (dates cleared), linked to the permit so its reminders stop. Answers the draft's id.
import { z } from "zod";
import { route } from "@/lib/http/route";
import { renewPermit } from "@/lib/applications/renew";

// The request carries no fields; an empty JSON object keeps the JSON content-type rule of route().
const bodySchema = z.object({}).strict().optional();

export const POST = route(
  { access: "application.create", body: bodySchema, ids: { id: "That permit" } },
  async ({ user, params }) => {
    const { application } = await renewPermit(user, params.id);
    return Response.json({ application, editUrl: `/applications/${application.id}/edit` }, { status: 201 });
  },
);
