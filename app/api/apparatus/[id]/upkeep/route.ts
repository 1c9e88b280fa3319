// PATCH /api/apparatus/[id]/upkeep — sets or clears the inspection interval in days (owner,
// department with apparatus.write, safety officers); the daily job reminds the owner when due.
import { route } from "@/lib/http/route";
import { setInspectionInterval } from "@/lib/upkeep/actions";
import { upkeepSettingsSchema } from "@/lib/upkeep/schemas";

export const PATCH = route(
  { ids: { id: "That apparatus" }, access: "apparatus.read", body: upkeepSettingsSchema },
  async ({ user, params, body }) => ({ apparatus: await setInspectionInterval(user, params.id, body) }),
);
