import "server-only";
import { desc, eq } from "drizzle-orm";
import { db } from "@/db";
import { ruleSets } from "@/db/schema";
import { DEFAULT_RULES, validateRules, type TierRules } from "@/lib/hazard";

// The tier rules in force: the newest admin-adopted rule set of kind "tier", else the engine's
// defaults. A stored set that no longer validates is ignored (and logged) rather than trusted.
export async function currentTierRules(): Promise<TierRules> {
  const [row] = await db
    .select({ rules: ruleSets.rules, version: ruleSets.version })
    .from(ruleSets)
    .where(eq(ruleSets.kind, "tier"))
    .orderBy(desc(ruleSets.version))
    .limit(1);
  if (!row) return DEFAULT_RULES;
  try {
    validateRules(row.rules);
    return row.rules as TierRules;
  } catch (error) {
    console.error(`[rules] tier rule set v${row.version} is invalid; using defaults:`, error);
    return DEFAULT_RULES;
  }
}
