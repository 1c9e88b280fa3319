// POST /api/assess — any signed-in user: the hazard engine's assessment of a set-up (SetupInput JSON,
// SI base units) under the institution's current tier rules. 422 names the offending field path.
import { assessSetup, formatInputPath, HazardInputError } from "@/lib/hazard";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { currentTierRules } from "@/lib/hazard-rules";
import { setupInputSchema, toSetupInput } from "@/lib/apparatus/setup-schema";

export const POST = route({ access: "hazard.assess", body: setupInputSchema }, async ({ body }) => {
  const rules = await currentTierRules();
  try {
    return { assessment: assessSetup(toSetupInput(body), rules) };
  } catch (error) {
    if (error instanceof HazardInputError) {
      const path = formatInputPath(error.path);
      throw new AppError("invalid", `${path}: ${error.problem}`, { issues: [{ path, message: error.problem }] });
    }
    throw error;
  }
});
