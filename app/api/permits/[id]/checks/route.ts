// POST /api/permits/[id]/checks — records a pre-use check of a permit in use: every item of its
// checklist answered yes / no / not applicable, with optional notes and photos (uploaded first). The
// holder, the people named on it and safety officers may record one. A retry with the same
// idempotency key answers 200 with the check already recorded; a new check answers 201. Any "no"
// e-mails the holder and the safety officers.
import { recordCheck } from "@/lib/checks/actions";
import { recordCheckSchema } from "@/lib/checks/schemas";
import { route } from "@/lib/http/route";

export const POST = route(
  { ids: { id: "That permit" }, access: "permit.check", body: recordCheckSchema },
  async ({ user, params, body }) => {
    const check = await recordCheck(user, params.id, body);
    return Response.json({ check }, { status: check.replayed ? 200 : 201 });
  },
);
