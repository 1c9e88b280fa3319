// GET /api/permits/[id] — one permit with its effective state and signatures, if this user may see it.
import { notFound } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { getPermit } from "@/lib/permits/queries";

export const GET = route({ access: "user", ids: { id: "That permit" } }, async ({ user, params }) => {
  const found = await getPermit(user, params.id);
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
