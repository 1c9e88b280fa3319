// Tier thresholds as a form (issue 18, item 3): every threshold has a row, values read in SI
// notation, tier order refused with a 422 that names the threshold, and the preview lists exactly the
// open applications and active permits whose tier a raised threshold would change.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { permits } from "@/db/schema";
import { withdrawApplication } from "@/lib/applications/actions";
import { DEFAULT_RULES, parseQuantity, type SetupInput, type TierRules } from "@/lib/hazard";
import { revokePermit } from "@/lib/permits/revoke";
import { decide } from "@/lib/review/decide";
import { previewTierRules } from "@/lib/rules/preview";
import { chainRulesFor, currentTierRuleSet } from "@/lib/rules/queries";
import { adoptRulesSchema } from "@/lib/rules/schemas";
import { checkTierRules, THRESHOLD_ROWS, thresholdAt, withThreshold } from "@/lib/rules/thresholds";
import { createUser, redatePermit, requireDatabase, TEST_PASSWORD } from "../support/db";
import { http, signIn } from "../support/http";
import { asActor, createSubmittedApplication, createTeam, isoDayFromNow, TIER_SETUPS } from "../review/support";

requireDatabase();

/** Every { value, unit, source } in a rule set, by its dotted path (walked here, not from the form's list). */
function thresholdPaths(rules: TierRules): string[] {
  const out: string[] = [];
  for (const [group, value] of Object.entries(rules)) {
    if (!value || typeof value !== "object" || Array.isArray(value)) continue;
    if (typeof (value as { value?: unknown }).value === "number") out.push(group);
    else
      for (const [key, inner] of Object.entries(value))
        if (inner && typeof inner === "object" && typeof (inner as { value?: unknown }).value === "number")
          out.push(`${group}.${key}`);
  }
  return out.sort();
}

describe("the threshold form's rows", () => {
  it("give every threshold of the engine's rules exactly one row, in the unit the engine stores", () => {
    expect(THRESHOLD_ROWS.map((r) => r.key).sort()).toEqual(thresholdPaths(DEFAULT_RULES));
    for (const row of THRESHOLD_ROWS) {
      // The unit a row is typed in must be the one validateRules expects (lib/hazard/rules.ts EXPECTED_UNITS).
      const t = thresholdAt(DEFAULT_RULES, row.path)!;
      expect(parseQuantity(`1 ${t.unit}`, row.dimension)).toEqual({ ok: true, value: 1 });
    }
  });

  it("read power and specific energy in SI notation, refusing a prefix on A²s", () => {
    // kilo = 10³, milli = 10⁻³: BIPM, The International System of Units, 9th edition (2019), table 7.
    expect(parseQuantity("1 kW", "power")).toEqual({ ok: true, value: 1000 });
    expect(parseQuantity("250 mW", "power")).toEqual({ ok: true, value: 0.25 });
    // IEC 60479-2 states the specific energy in A²s; 0.0025 A²s is its default threshold here.
    expect(parseQuantity("0.0025 A²s", "specific energy")).toEqual({ ok: true, value: 0.0025 });
    expect(parseQuantity("0.0025 A2s", "specific energy")).toEqual({ ok: true, value: 0.0025 });
    expect(parseQuantity("2.5 mA²s", "specific energy").ok).toBe(false);
    expect(parseQuantity("1 kW", "energy")).toMatchObject({ ok: false, error: { code: "wrong-dimension" } });
  });
});

describe("tier order", () => {
  const unordered = () => {
    // A lethal-shock energy below the heavy-shock energy (0.25 J) would make tier 2 unreachable.
    const rules = withThreshold(structuredClone(DEFAULT_RULES), ["lethal", "energy"], {
      ...DEFAULT_RULES.lethal.energy,
      value: 0.1,
    });
    return { ...rules, rulesVersion: "aldermere-unordered-1" };
  };

  it("is checked by the engine and names both thresholds in words", () => {
    const issue = checkTierRules(unordered());
    expect(issue?.path).toEqual(["lethal", "energy", "value"]);
    expect(issue?.message).toContain("Tier 3 · lethal shock from: Stored energy from which a discharge can kill");
    expect(issue?.message).toContain("(rules.reflex.energy)");
    const parsed = adoptRulesSchema.safeParse({ kind: "tier", rules: unordered() });
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues.map((i) => i.path.join("."))).toEqual(["rules.lethal.energy.value"]);
  });

  it("answers 422 naming the threshold, from the preview and from adopting", async () => {
    const admin = await createUser({ roles: ["admin"] });
    const cookie = await signIn(admin.email);
    for (const [path, body] of [
      ["/api/admin/rules/preview", { rules: unordered() }],
      ["/api/admin/rules", { kind: "tier", rules: unordered(), note: "Out of order." }],
    ] as const) {
      const res = await http(path, { method: "POST", cookie, body });
      expect(res.status).toBe(422);
      expect(res.json?.error.issues[0].path).toBe("rules.lethal.energy.value");
      expect(res.json?.error.message).toContain("rules.lethal.energy.value: Tier 3 · lethal shock from");
    }
    const garbled = await http("/api/admin/rules/preview", {
      method: "POST",
      cookie,
      body: {
        rules: { ...DEFAULT_RULES, arc: { ...DEFAULT_RULES.arc, energy: { value: "lots", unit: "J", source: "x" } } },
      },
    });
    expect(garbled.status).toBe(422);
    expect(garbled.json?.error.issues[0].path).toBe("rules.arc.energy.value");
  });
});

describe("the preview of raised thresholds", () => {
  // ½·C·V² worked by hand: 1 mF at 5 kV holds ½ × 10⁻³ F × (5000 V)² = 12 500 J; 2 mF at 5 kV holds
  // 25 000 J. LBNL ESM 2.2.13 (hazard-model.md's default table) puts arc and blast at 10 kJ and more
  // (tier 4) and a lethal shock at 10 J and more at 100 V or more (tier 3). Raising the arc threshold
  // to 20 kJ takes the 12.5 kJ bank to tier 3 and leaves the 25 kJ bank at tier 4.
  const MOVES: SetupInput = TIER_SETUPS[4];
  const STAYS: SetupInput = {
    sources: [{ id: "Bank", kind: "capacitor", capacitance_F: 2e-3, voltage_V: 5000, bleeder_ohm: 1e6 }],
  };

  it("lists exactly the open applications and active permits whose tier would change", async () => {
    const team = await createTeam();
    const admin = await createUser({ roles: ["admin"], departmentId: team.office.id });
    const officerAdmin = await createUser({ roles: ["admin", "safety_officer"], departmentId: team.office.id });
    const submit = (setup: SetupInput, title: string) =>
      createSubmittedApplication({ applicant: team.instructor, tier: 4, setup, title });
    const recommend = async (id: string, version: number) =>
      decide(asActor(team.reviewer), id, { kind: "recommend", expectedVersion: version, comment: "Figures checked." });
    const issue = async (setup: SetupInput, title: string) => {
      const { application } = await submit(setup, title);
      const rec = await recommend(application.id, application.version);
      const rules = await chainRulesFor(rec.application.chainRulesVersion);
      const result = await decide(asActor(team.officer), application.id, {
        kind: "approve",
        expectedVersion: rec.application.version,
        password: TEST_PASSWORD,
        confirmedRequirements: rules.tiers[4].requirements.map((r) => r.id),
        extraConditions: [],
      });
      return result.permit!;
    };

    const submittedMoves = (await submit(MOVES, "Bank, submitted")).application;
    const submittedStays = (await submit(STAYS, "Large bank, submitted")).application;
    const inReview = (await submit(MOVES, "Bank, in review")).application;
    await recommend(inReview.id, inReview.version);
    const withdrawn = (await submit(MOVES, "Bank, withdrawn")).application;
    await withdrawApplication(asActor(team.instructor), withdrawn.id, withdrawn.version);

    const permitMoves = await issue(MOVES, "Bank, permit");
    const permitStays = await issue(STAYS, "Large bank, permit");
    const revoked = await issue(MOVES, "Bank, revoked permit");
    await revokePermit(asActor(team.officer), revoked.id, {
      expectedVersion: revoked.version,
      password: TEST_PASSWORD,
      reason: "Bench taken down.",
    });
    const expired = await issue(MOVES, "Bank, expired permit");
    await redatePermit(expired.id, { validFrom: isoDayFromNow(-40), validTo: isoDayFromNow(-10) });

    const inForce = (await currentTierRuleSet()).rules;
    const raised = {
      ...withThreshold(inForce, ["arc", "energy"], { ...inForce.arc.energy, value: 20_000, source: "Aldermere rule" }),
      rulesVersion: "aldermere-arc-20kJ",
    };
    const today = new Date().toISOString().slice(0, 10);
    const preview = await previewTierRules(asActor(officerAdmin), raised, today);

    const ours = new Set(
      [submittedMoves, submittedStays, inReview, withdrawn]
        .map((a) => a.id)
        .concat([permitMoves, permitStays, revoked, expired].map((p) => p.id)),
    );
    const apps = preview.applications.filter((m) => ours.has(m.id));
    const held = preview.permits.filter((m) => ours.has(m.id));
    expect(apps.map((m) => m.id).sort()).toEqual([submittedMoves.id, inReview.id].sort());
    expect(held.map((m) => m.id)).toEqual([permitMoves.id]);
    for (const m of [...apps, ...held]) expect(m).toMatchObject({ tierNow: 4, tierNew: 3, recordedTier: 4 });
    expect(apps.find((m) => m.id === inReview.id)?.title).toBe("Bank, in review");
    const [stored] = await getDb()
      .select({ number: permits.number })
      .from(permits)
      .where(eq(permits.id, permitMoves.id));
    expect(held[0].reference).toBe(stored.number);

    // The same thresholds in force list none of ours: the preview shows what the change does.
    const same = await previewTierRules(asActor(officerAdmin), inForce, today);
    expect([...same.applications, ...same.permits].filter((m) => ours.has(m.id))).toEqual([]);

    // Over HTTP as an admin who may not read applications: the same records, without their titles.
    const cookie = await signIn(admin.email);
    const res = await http("/api/admin/rules/preview", { method: "POST", cookie, body: { rules: raised } });
    expect(res.status).toBe(200);
    const overHttp = res.json!.preview as typeof preview;
    expect(
      overHttp.applications
        .filter((m) => ours.has(m.id))
        .map((m) => m.id)
        .sort(),
    ).toEqual([submittedMoves.id, inReview.id].sort());
    expect(overHttp.permits.filter((m) => ours.has(m.id)).map((m) => [m.id, m.title])).toEqual([
      [permitMoves.id, null],
    ]);

    // Nothing was adopted by previewing.
    expect((await currentTierRuleSet()).rules.rulesVersion).not.toBe("aldermere-arc-20kJ");
  });
});
