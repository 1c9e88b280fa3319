// GET /api/admin/rules — the chain rules, tier thresholds and reminder schedule in force, with their
// versions. POST /api/admin/rules — adopt a new version of one kind ({ kind, rules, note }); earlier
// versions stay, and applications keep the chain rules they were submitted under.
import { route } from "@/lib/http/route";
import { adoptRuleSet } from "@/lib/rules/actions";
import { currentChainRules, currentReminderRules, currentTierRuleSet } from "@/lib/rules/queries";
import { adoptRulesSchema } from "@/lib/rules/schemas";

export const GET = route({ access: "admin.rules" }, async () => {
  const [chain, tier, reminders] = await Promise.all([
    currentChainRules(),
    currentTierRuleSet(),
    currentReminderRules(),
  ]);
  return { chain, tier, reminders };
});

export const POST = route({ access: "admin.rules", body: adoptRulesSchema }, async ({ user, body }) => {
  const ruleSet = await adoptRuleSet(user, body);
  return Response.json({ ruleSet }, { status: 201 });
});
