import { z } from "zod";
import type { TierRules } from "@/lib/hazard";
import { chainRulesSchema, reminderRulesSchema } from "./chain";
import { checkTierRules } from "./thresholds";

// What an admin sends to adopt a new version of one kind of rules (POST /api/admin/rules). The tier
// thresholds are checked by the engine's own validateRules, its field path kept for the 422 answer and
// the threshold named in words (lib/rules/thresholds.ts).

const note = z.string().trim().max(500, "Use at most 500 characters for the note.").default("");

export const tierRulesSchema = z.unknown().superRefine((value, ctx) => {
  // validateRules names paths from "rules"; the body already nests them under "rules".
  const issue = checkTierRules(value);
  if (issue) ctx.addIssue({ code: "custom", path: issue.path, message: issue.message });
}) as unknown as z.ZodType<TierRules>;

/** POST /api/admin/rules/preview: thresholds to compare with those in force (nothing is adopted). */
export const previewTierRulesSchema = z.object({ rules: tierRulesSchema });

export const adoptRulesSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("chain"), rules: chainRulesSchema, note }),
  z.object({ kind: z.literal("tier"), rules: tierRulesSchema, note }),
  z.object({ kind: z.literal("reminders"), rules: reminderRulesSchema, note }),
]);

export type AdoptRulesInput = z.infer<typeof adoptRulesSchema>;
