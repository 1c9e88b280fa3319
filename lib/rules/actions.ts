import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/db";
import { isUniqueViolation } from "@/db/errors";
import { ruleSets } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { AppError, conflict } from "@/lib/errors";
import { currentTierRuleSet } from "./queries";
import type { AdoptRulesInput } from "./schemas";

// Adopting a rule set appends a new version; nothing earlier is changed, so every application keeps
// the chain rules it was submitted under and every assessment names the tier rules it used.

export async function adoptRuleSet(actor: CurrentUser, input: AdoptRulesInput) {
  assertCan(actor, "admin.rules");
  if (input.kind === "tier") {
    const current = await currentTierRuleSet();
    if (current.rules.rulesVersion === input.rules.rulesVersion) {
      // Assessments record the rules version by this name: two different rule sets must not share it.
      throw new AppError("invalid", "rules.rulesVersion: give the new thresholds a new version name", {
        issues: [{ path: "rules.rulesVersion", message: "Give the new thresholds a new version name." }],
      });
    }
  }
  try {
    return await db.transaction(async (tx) => {
      const [row] = await tx
        .insert(ruleSets)
        .values({
          kind: input.kind,
          version: sql`(SELECT coalesce(max(${ruleSets.version}), 0) + 1 FROM ${ruleSets} WHERE ${ruleSets.kind} = ${input.kind})`,
          rules: input.rules as unknown as Record<string, unknown>,
          note: input.note,
          createdById: actor.id,
        })
        .returning({ id: ruleSets.id, kind: ruleSets.kind, version: ruleSets.version, createdAt: ruleSets.createdAt });
      await writeAudit(tx, {
        actor,
        action: "rules.adopted",
        entityType: "rule_set",
        entityId: row.id,
        data: { kind: row.kind, version: row.version, note: input.note },
      });
      return row;
    });
  } catch (error) {
    if (isUniqueViolation(error))
      throw conflict("Another admin adopted a version at the same moment. Reload and try again.");
    throw error;
  }
}
