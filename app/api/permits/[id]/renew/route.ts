// POST /api/permits/[id]/renew — the holder starts a renewal: a new draft prefilled from the permit's
// application (dates cleared), linked to the permit so its reminders stop. Answers the draft's id.
import { z } from "zod";
import { fromZodError } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { renewPermit } from "@/lib/applications/renew";

const idSchema = z.uuid({ error: "must be a permit id" });
// The request carries no fields; an empty JSON object keeps the JSON content-type rule of route().
const bodySchema = z.object({}).strict().optional();

export const POST = route({ access: "application.create", body: bodySchema }, async ({ user, params }) => {
  const id = idSchema.safeParse(params.id);
  if (!id.success) throw fromZodError(id.error, "id");
  const { application } = await renewPermit(user, id.data);
  return Response.json({ application, editUrl: `/applications/${application.id}/edit` }, { status: 201 });
});
