import "server-only";
import type { TierRules } from "@/lib/hazard";
import { currentTierRuleSet } from "@/lib/rules/queries";

// The tier rules in force for assessments: the newest admin-adopted rule set of kind "tier", else
// the engine's defaults (lib/rules/queries.ts decides, and ignores a stored set that fails to validate).
export async function currentTierRules(): Promise<TierRules> {
  return (await currentTierRuleSet()).rules;
}
