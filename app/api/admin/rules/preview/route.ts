// POST /api/admin/rules/preview — the open applications and active permits whose tier the proposed
// thresholds ({ rules }) would change, each assessed again by the engine on its stored set-up (old
// tier → new tier). Adopts nothing; 422 names the threshold that is out of order or malformed.
import { route } from "@/lib/http/route";
import { institutionToday } from "@/lib/permits/queries";
import { previewTierRules } from "@/lib/rules/preview";
import { previewTierRulesSchema } from "@/lib/rules/schemas";

export const POST = route({ access: "admin.rules", body: previewTierRulesSchema }, async ({ user, body }) => {
  const preview = await previewTierRules(user, body.rules, await institutionToday());
  return { preview };
});
