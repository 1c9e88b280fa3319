import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents } from "@/db/schema";
import { DEFAULT_RULES } from "@/lib/hazard";
import { AppError } from "@/lib/errors";
import { inclusiveDays } from "@/lib/permits/dates";
import { decide } from "@/lib/review/decide";
import {
  approvalRequirements,
  audienceRequirements,
  chainRulesSchema,
  DEFAULT_CHAIN_RULES,
  DEFAULT_REMINDER_RULES,
  type ChainRules,
} from "@/lib/rules/chain";
import { adoptRuleSet } from "@/lib/rules/actions";
import { chainRulesFor, currentChainRules, currentReminderRules, currentTierRuleSet } from "@/lib/rules/queries";
import { adoptRulesSchema } from "@/lib/rules/schemas";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import { asActor, createOfficer, createSubmittedApplication, createTeam, isoDayFromNow } from "./support";

requireDatabase();

const clone = (r: ChainRules): ChainRules => structuredClone(r);

function issuesOf(body: unknown): { path: string; message: string }[] {
  const parsed = adoptRulesSchema.safeParse(body);
  if (parsed.success) return [];
  return parsed.error.issues.map((i) => ({ path: i.path.join("."), message: i.message }));
}

describe("the default chain rules (product.md, Default rules)", () => {
  it("match the product's table", () => {
    expect(DEFAULT_CHAIN_RULES.tiers.map((t) => t.steps)).toEqual([
      [],
      ["reviewer"],
      ["reviewer", "safety_officer"],
      ["reviewer", "safety_officer"],
      ["reviewer", "safety_officer"],
    ]);
    expect(DEFAULT_CHAIN_RULES.tiers.map((t) => t.validityDays)).toEqual([365, 365, 180, 90, 30]);
    expect(DEFAULT_CHAIN_RULES.tiers[2].requirements.map((r) => r.id)).toEqual(["named-operator-trained"]);
    expect(DEFAULT_CHAIN_RULES.tiers[3].requirements.map((r) => r.id)).toEqual([
      "second-trained-person",
      "barrier-at-limited-approach",
    ]);
    // Tier 4: all of tier 3, plus the enclosure or remote operation and the officer's pre-use check.
    expect(DEFAULT_CHAIN_RULES.tiers[4].requirements.map((r) => r.id)).toEqual([
      "second-trained-person",
      "barrier-at-limited-approach",
      "interlock-or-remote",
      "officer-pre-use-check",
    ]);
    expect(chainRulesSchema.safeParse(DEFAULT_CHAIN_RULES).success).toBe(true);
    expect(DEFAULT_REMINDER_RULES.daysBefore).toEqual([30, 7, 1, 0]);
  });

  it("refuse rule sets that would let a higher tier through on fewer signatures or for longer", () => {
    const noOfficer = clone(DEFAULT_CHAIN_RULES);
    noOfficer.tiers[3].steps = ["reviewer"];
    expect(issuesOf({ kind: "chain", rules: noOfficer }).map((i) => i.path)).toContain("rules.tiers.3.steps");

    const longer = clone(DEFAULT_CHAIN_RULES);
    longer.tiers[4].validityDays = 120;
    expect(issuesOf({ kind: "chain", rules: longer })).toContainEqual({
      path: "rules.tiers.4.validityDays",
      message: "May not be longer than tier 3 (90 days).",
    });

    const twice = clone(DEFAULT_CHAIN_RULES);
    twice.tiers[2].steps = ["reviewer", "reviewer"] as never;
    expect(issuesOf({ kind: "chain", rules: twice }).map((i) => i.path)).toContain("rules.tiers.2.steps");

    const reversed = clone(DEFAULT_CHAIN_RULES);
    reversed.tiers[2].steps = ["safety_officer", "reviewer"];
    expect(issuesOf({ kind: "chain", rules: reversed }).map((i) => i.path)).toContain("rules.tiers.2.steps");

    const zero = clone(DEFAULT_CHAIN_RULES);
    zero.tiers[0].validityDays = 0;
    expect(issuesOf({ kind: "chain", rules: zero }).map((i) => i.path)).toContain("rules.tiers.0.validityDays");

    const badId = clone(DEFAULT_CHAIN_RULES);
    badId.tiers[3].requirements = [{ id: "Not An Id", text: "Something to confirm." }];
    expect(issuesOf({ kind: "chain", rules: badId }).map((i) => i.path)).toContain("rules.tiers.3.requirements.0.id");
  });
});

// Issue 20, item 9. What a safety office expects of a public demonstration (common practice): the
// front-row distance, a steward and a first aider for the public or 50 people and more, and a briefing
// for the public; nothing for a touch-safe tier-0 set-up.
describe("audience controls", () => {
  const ids = (list: { id: string }[]) => list.map((r) => r.id);
  it("add the public's controls to the tier's, and the crowd's from 50 people", () => {
    const rules = DEFAULT_CHAIN_RULES;
    expect(ids(audienceRequirements(rules, 2, { audience: "public", audienceSize: 80 }))).toEqual([
      "front-row-distance",
      "audience-steward",
      "first-aider-present",
      "audience-briefing",
    ]);
    expect(ids(audienceRequirements(rules, 2, { audience: "students", audienceSize: 40 }))).toEqual([]);
    expect(ids(audienceRequirements(rules, 3, { audience: "students", audienceSize: 60 }))).toEqual([
      "front-row-distance",
      "audience-steward",
      "first-aider-present",
    ]);
    expect(ids(audienceRequirements(rules, 0, { audience: "public", audienceSize: 300 }))).toEqual([]);
    expect(ids(approvalRequirements(rules, 2, { audience: "public", audienceSize: 10 }))).toEqual([
      "named-operator-trained",
      "front-row-distance",
      "audience-steward",
      "first-aider-present",
      "audience-briefing",
    ]);
  });

  it("are part of the versioned chain rules: older versions read with the defaults, a control needs a trigger", () => {
    const { audience: _audience, ...older } = DEFAULT_CHAIN_RULES;
    const parsed = chainRulesSchema.parse(older);
    expect(parsed.audience).toEqual(DEFAULT_CHAIN_RULES.audience);
    const never = clone(DEFAULT_CHAIN_RULES);
    never.audience[0] = { ...never.audience[0], public: false, minSize: null };
    expect(chainRulesSchema.safeParse(never).success).toBe(false);
    const none = { ...clone(DEFAULT_CHAIN_RULES), audience: [] };
    expect(
      ids(approvalRequirements(chainRulesSchema.parse(none), 2, { audience: "public", audienceSize: 80 })),
    ).toEqual(["named-operator-trained"]);
  });
});

describe("adopting rule sets", () => {
  afterAll(async () => {
    // Leave the defaults in force for the test files that follow.
    const admin = await createUser({ roles: ["admin"] });
    await adoptRuleSet(
      asActor(admin),
      adoptRulesSchema.parse({ kind: "chain", rules: DEFAULT_CHAIN_RULES, note: "restore" }),
    );
    const tier = await currentTierRuleSet();
    if (tier.rules.rulesVersion !== DEFAULT_RULES.rulesVersion) {
      await adoptRuleSet(
        asActor(admin),
        adoptRulesSchema.parse({ kind: "tier", rules: DEFAULT_RULES, note: "restore" }),
      );
    }
    await adoptRuleSet(
      asActor(admin),
      adoptRulesSchema.parse({ kind: "reminders", rules: DEFAULT_REMINDER_RULES, note: "restore" }),
    );
  });

  it("is for admins only", async () => {
    const officer = await createOfficer({ departmentId: null });
    await expect(
      adoptRuleSet(asActor(officer), adoptRulesSchema.parse({ kind: "reminders", rules: { daysBefore: [7] } })),
    ).rejects.toMatchObject({ status: 403 });
  });

  it("keeps each application on the chain rules version it was submitted under", async () => {
    const admin = await createUser({ roles: ["admin"] });
    const team = await createTeam();
    // A year-long teaching block: the window is cut to each version's longest validity.
    const longEvent = { firstDay: isoDayFromNow(1), lastDay: isoDayFromNow(500) };
    const before = await createSubmittedApplication({ applicant: team.instructor, tier: 1, ...longEvent });
    const oldVersion = before.application.chainRulesVersion;

    const stricter = clone(DEFAULT_CHAIN_RULES);
    // A higher tier may not outlast a lower one, so tiers 2 and 3 come down to 60 days too.
    for (const t of [1, 2, 3] as const) stricter.tiers[t].validityDays = 60;
    const adopted = await adoptRuleSet(
      asActor(admin),
      adoptRulesSchema.parse({ kind: "chain", rules: stricter, note: "Shorter sting permits." }),
    );
    expect(adopted.version).toBe((oldVersion ?? 0) + 1);
    expect((await currentChainRules()).version).toBe(adopted.version);
    const [audit] = await getDb()
      .select({ action: auditEvents.action, data: auditEvents.data, actorId: auditEvents.actorId })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityType, "rule_set"), eq(auditEvents.entityId, adopted.id)));
    expect(audit).toMatchObject({
      action: "rules.adopted",
      actorId: admin.id,
      data: { kind: "chain", version: adopted.version },
    });

    const after = await createSubmittedApplication({ applicant: team.instructor, tier: 1, ...longEvent });
    expect(after.application.chainRulesVersion).toBe(adopted.version);
    expect((await chainRulesFor(oldVersion)).tiers[1].validityDays).toBe(365);

    const approve = (id: string, version: number) =>
      decide(asActor(team.reviewer), id, {
        kind: "approve",
        expectedVersion: version,
        password: TEST_PASSWORD,
        confirmedRequirements: [],
        extraConditions: [],
      });
    const oldPermit = (await approve(before.application.id, before.application.version)).permit!;
    const newPermit = (await approve(after.application.id, after.application.version)).permit!;
    expect(inclusiveDays(oldPermit.validFrom, oldPermit.validTo)).toBe(365);
    expect(inclusiveDays(newPermit.validFrom, newPermit.validTo)).toBe(60);
  });

  it("checks tier thresholds with the engine's validateRules and names the field", async () => {
    const admin = await createUser({ roles: ["admin"] });
    const broken = structuredClone(DEFAULT_RULES);
    broken.rulesVersion = "local-broken";
    broken.touchSafe.dcVoltage = { ...broken.touchSafe.dcVoltage, unit: "kV" };
    expect(issuesOf({ kind: "tier", rules: broken })).toEqual([
      {
        path: "rules.touchSafe.dcVoltage.unit",
        // The threshold named in words (lib/rules/thresholds.ts), then the engine's own finding.
        message:
          'Tier 0 · touch-safe up to: DC voltage at or below which a part is touch-safe (rules.touchSafe.dcVoltage) must be "V"',
      },
    ]);

    const unordered = structuredClone(DEFAULT_RULES);
    unordered.rulesVersion = "local-unordered";
    unordered.lethal.energy = { ...unordered.lethal.energy, value: 0.1 };
    expect(issuesOf({ kind: "tier", rules: unordered }).map((i) => i.path)).toEqual(["rules.lethal.energy.value"]);

    const sameName = structuredClone(DEFAULT_RULES);
    sameName.lethal.energy = { ...sameName.lethal.energy, value: 5 };
    const error = await adoptRuleSet(asActor(admin), adoptRulesSchema.parse({ kind: "tier", rules: sameName })).catch(
      (e: AppError) => e,
    );
    expect(error).toBeInstanceOf(AppError);
    expect((error as AppError).details.issues).toEqual([
      { path: "rules.rulesVersion", message: "Give the new thresholds a new version name." },
    ]);

    const stricter = structuredClone(DEFAULT_RULES);
    stricter.rulesVersion = "aldermere-local-1";
    stricter.lethal.energy = {
      ...stricter.lethal.energy,
      value: 5,
      source: "institution rule (stricter than LBNL's 10 J)",
    };
    await adoptRuleSet(asActor(admin), adoptRulesSchema.parse({ kind: "tier", rules: stricter }));
    const current = await currentTierRuleSet();
    expect(current.rules.rulesVersion).toBe("aldermere-local-1");
    expect(current.rules.lethal.energy.value).toBe(5);
  });

  it("stores the reminder schedule sorted, refusing repeats", async () => {
    const admin = await createUser({ roles: ["admin"] });
    expect(issuesOf({ kind: "reminders", rules: { daysBefore: [7, 7] } }).map((i) => i.path)).toEqual([
      "rules.daysBefore",
    ]);
    expect(issuesOf({ kind: "reminders", rules: { daysBefore: [] } }).map((i) => i.path)).toEqual(["rules.daysBefore"]);
    expect(issuesOf({ kind: "reminders", rules: { daysBefore: [-1] } }).map((i) => i.path)).toEqual([
      "rules.daysBefore.0",
    ]);
    await adoptRuleSet(
      asActor(admin),
      adoptRulesSchema.parse({ kind: "reminders", rules: { daysBefore: [1, 14, 0] } }),
    );
    expect((await currentReminderRules()).rules.daysBefore).toEqual([14, 1, 0]);
  });
});
