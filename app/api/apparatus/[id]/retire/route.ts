// POST /api/apparatus/[id]/retire — retires an apparatus with a reason (owner, department with
// apparatus.write, safety officers): kept for the record, no longer offered for new applications.
import { route } from "@/lib/http/route";
import { retireApparatus } from "@/lib/upkeep/actions";
import { retireSchema } from "@/lib/upkeep/schemas";

export const POST = route(
  { ids: { id: "That apparatus" }, access: "apparatus.read", body: retireSchema },
  async ({ user, params, body }) => ({ apparatus: await retireApparatus(user, params.id, body) }),
);
