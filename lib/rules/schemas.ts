import { z } from "zod";
import { HazardInputError, validateRules, type TierRules } from "@/lib/hazard";
import { chainRulesSchema, reminderRulesSchema } from "./chain";

// What an admin sends to adopt a new version of one kind of rules (POST /api/admin/rules). The tier
// thresholds are checked by the engine's own validateRules, its field path kept for the 422 answer.

const note = z.string().trim().max(500, "Use at most 500 characters for the note.").default("");

export const tierRulesSchema = z.unknown().superRefine((value, ctx) => {
  try {
    validateRules(value);
  } catch (error) {
    if (!(error instanceof HazardInputError)) throw error;
    // validateRules names paths from "rules"; the body already nests them under "rules".
    const path = error.path[0] === "rules" ? error.path.slice(1) : error.path;
    ctx.addIssue({ code: "custom", path, message: error.problem });
  }
}) as unknown as z.ZodType<TierRules>;

export const adoptRulesSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("chain"), rules: chainRulesSchema, note }),
  z.object({ kind: z.literal("tier"), rules: tierRulesSchema, note }),
  z.object({ kind: z.literal("reminders"), rules: reminderRulesSchema, note }),
]);

export type AdoptRulesInput = z.infer<typeof adoptRulesSchema>;
