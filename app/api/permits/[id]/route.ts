// GET /api/permits/[id] — one permit with its effective state and signatures, if this user may see it.
import { z } from "zod";
import { fromZodError, notFound } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { getPermit } from "@/lib/permits/queries";

const idSchema = z.uuid({ error: "must be a permit id" });

export const GET = route({ access: "user" }, async ({ user, params }) => {
  const id = idSchema.safeParse(params.id);
  if (!id.success) throw fromZodError(id.error, "id");
  const found = await getPermit(user, id.data);
  if (!found) throw notFound("That permit");
  const { permit, application, revision, holderName, departmentName, effectiveState, signatures } = found;
  return {
    permit: { ...permit, state: effectiveState, storedState: permit.state },
    application: { id: application.id, title: application.title },
    revision: {
      id: revision.id,
      revision: revision.revision,
      contentHash: revision.contentHash,
      tier: revision.assessment.tier,
    },
    holderName,
    departmentName,
    signatures,
  };
});
