// The demo story of the fictional Aldermere Institute of Technology: five apparatus from tier 0 to 4
// and applications in every state, with permits active, ending this week, expired and revoked. It goes
// through the real domain functions (registry, drafts, submission, signed decisions, revocation), so
// every row has its revisions, audit events and queued mail. Run by scripts/demo-data.ts once; invented data.
import { and, eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { auditEvents, decisions, permits, users } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { createApparatus } from "@/lib/apparatus/actions";
import { setupToText } from "@/lib/apparatus/setup-text";
import { createDraft, saveDraft, submitApplication, withdrawApplication } from "@/lib/applications/actions";
import { currentUserColumns, type CurrentUser } from "@/lib/auth/current-user";
import { assessSetup, requiredControls, type SetupInput } from "@/lib/hazard";
import { revokePermit } from "@/lib/permits/revoke";
import { decisionHmac } from "@/lib/records/seal";
import { decide } from "@/lib/review/decide";
import { currentChainRules } from "@/lib/rules/queries";
import { tierChain } from "@/lib/rules/chain";
import { applicationDraftSchema, type ApplicationDraft } from "@/lib/applications/schemas";

const STORY_DONE = "demo.story_seeded";

type Apparatus = { name: string; room: string; notes: string; setup: SetupInput };

// Values picked so that each lands in its tier under the default rules (checked when seeding).
const APPARATUS: Record<0 | 1 | 2 | 3 | 4, Apparatus> = {
  0: {
    name: "Tabletop influence machine",
    room: "B12 lecture theatre",
    notes: "Two small jars of about 50 pF each on an influence machine; sparks of a few centimetres.",
    setup: {
      sources: [{ id: "Jar pair", kind: "capacitor", capacitance_F: 50e-12, voltage_V: 30e3, count: 2 }],
      vacuumDevice: false,
    },
  },
  1: {
    name: "Discharge tube supply",
    room: "C04 teaching lab",
    notes: "Current-limited supply for gas discharge tubes; the tubes are glass, partly evacuated.",
    setup: {
      sources: [
        {
          id: "Supply",
          kind: "dc-supply",
          voltage_V: 5000,
          currentLimit_A: 10e-3,
          seriesResistance_ohm: 100e3,
          outputCapacitance_F: 2e-9,
        },
      ],
      vacuumDevice: true,
    },
  },
  2: {
    name: "Belt-charged sphere generator with spark gap",
    room: "Outreach hall",
    notes: "Sphere terminal of 30 cm radius; a 25 cm sphere gap to ground limits the voltage.",
    setup: {
      sources: [{ id: "Terminal", kind: "sphere-terminal", radius_m: 0.3 }],
      gaps: [{ sphereDiameter_m: 0.25, spacing_m: 0.08, across: ["Terminal"] }],
    },
  },
  3: {
    name: "Bank of jar capacitors",
    room: "B12 lecture theatre",
    notes: "Eight glass jars in parallel, charged to 25 kV for the long-spark demonstration.",
    setup: {
      sources: [
        { id: "Jar bank", kind: "capacitor", capacitance_F: 5e-9, voltage_V: 25e3, count: 8, bleeder_ohm: 500e6 },
      ],
      gaps: [{ sphereDiameter_m: 0.05, spacing_m: 0.012, across: ["Jar bank"] }],
    },
  },
  4: {
    name: "Pulsed capacitor bank",
    room: "High-voltage cell, basement",
    notes: "Eight 100 µF capacitors switched by a triggered gap; operated from outside the cell.",
    setup: {
      sources: [
        {
          id: "Bank",
          kind: "capacitor",
          capacitance_F: 100e-6,
          voltage_V: 5000,
          count: 8,
          ratedVoltage_V: 6000,
          bleeder_ohm: 50e3,
        },
      ],
    },
  },
};

const DAY = 86_400_000;
const isoDay = (offsetDays: number) => new Date(Date.now() + offsetDays * DAY).toISOString().slice(0, 10);

function draftFor(options: {
  tier: 0 | 1 | 2 | 3 | 4;
  title: string;
  kind: "lecture_demonstration" | "outreach_event" | "teaching_lab" | "research_bench";
  audience: "none" | "students" | "public";
  audienceSize: number;
  apparatus: { id: string; revisionId: string };
  responsible: { id: string; name: string };
  firstDay: number;
  lastDay: number;
}): ApplicationDraft {
  const source = APPARATUS[options.tier];
  const tier = assessSetup(source.setup).tier;
  return applicationDraftSchema.parse({
    event: {
      title: options.title,
      kind: options.kind,
      room: source.room,
      audience: options.audience,
      audienceSize: String(options.audienceSize),
      firstDay: isoDay(options.firstDay),
      lastDay: isoDay(options.lastDay),
      responsible: { userId: options.responsible.id, name: options.responsible.name, trained: true },
      // The applicant runs the bench themselves: reviewers and officers named here could not sign.
      operators: [{ userId: options.responsible.id, name: options.responsible.name, trained: true }],
    },
    apparatus: {
      apparatusId: options.apparatus.id,
      apparatusRevisionId: options.apparatus.revisionId,
      name: source.name,
      room: source.room,
      notes: source.notes,
      setup: setupToText(source.setup),
    },
    controls: {
      required: requiredControls(tier).map((c) => ({
        code: c.id,
        confirmed: true,
        note: c.fromTier >= 3 ? "Written procedure kept in the bench folder." : "",
      })),
      additional: tier >= 2 ? "Audience seated behind the marked line; the room lights stay on." : "",
    },
    attestation: { accepted: true },
  });
}

async function asCurrentUser(email: string): Promise<CurrentUser> {
  const [u] = await getDb().select(currentUserColumns).from(users).where(eq(users.email, email));
  if (!u) throw new Error(`demo user ${email} is missing`);
  return u;
}

export async function seedStory(password: string): Promise<boolean> {
  const db = getDb();
  const [done] = await db.select({ id: auditEvents.id }).from(auditEvents).where(eq(auditEvents.action, STORY_DONE));
  if (done) return false;

  const instructor = await asCurrentUser("instructor@benchclear.test");
  const reviewer = await asCurrentUser("reviewer@benchclear.test");
  const officer = await asCurrentUser("officer@benchclear.test");
  const signing = { ip: "seed" };

  const registry = {} as Record<0 | 1 | 2 | 3 | 4, { id: string; revisionId: string }>;
  for (const tier of [0, 1, 2, 3, 4] as const) {
    const a = APPARATUS[tier];
    const created = await createApparatus(instructor, a);
    if (created.tier !== tier) throw new Error(`${a.name} assessed as tier ${created.tier}, expected ${tier}`);
    registry[tier] = { id: created.id, revisionId: created.revisionId };
  }

  const person = { id: instructor.id, name: instructor.name };
  async function application(
    tier: 0 | 1 | 2 | 3 | 4,
    title: string,
    extra: Partial<Parameters<typeof draftFor>[0]> = {},
  ) {
    const draft = draftFor({
      tier,
      title,
      kind: "lecture_demonstration",
      audience: "students",
      audienceSize: 60,
      apparatus: registry[tier],
      responsible: person,
      firstDay: 3,
      lastDay: 4,
      ...extra,
    });
    const created = await createDraft(instructor, { draft });
    const saved = await saveDraft(instructor, created.id, { expectedVersion: created.version, step: 6, draft });
    return { id: created.id, version: saved.version };
  }
  async function submitted(
    tier: 0 | 1 | 2 | 3 | 4,
    title: string,
    extra: Partial<Parameters<typeof draftFor>[0]> = {},
  ) {
    const app = await application(tier, title, extra);
    const after = await submitApplication(instructor, app.id, app.version);
    return { id: app.id, version: after.version };
  }
  const rules = (await currentChainRules()).rules;
  // The tier's requirements and every audience control (an approver confirming one that does not apply
  // to the event changes nothing; the permit prints only those that do).
  const requirementIds = (tier: number) => [
    ...tierChain(rules, tier).requirements.map((r) => r.id),
    ...rules.audience.map((r) => r.id),
  ];
  async function approveThrough(
    tier: 0 | 1 | 2 | 3 | 4,
    title: string,
    extra: Partial<Parameters<typeof draftFor>[0]> = {},
  ) {
    let app = await submitted(tier, title, extra);
    if (tier === 0) return app.id;
    if (tier === 1) {
      await decide(
        reviewer,
        app.id,
        {
          kind: "approve",
          expectedVersion: app.version,
          password,
          confirmedRequirements: requirementIds(1),
          extraConditions: [],
        },
        signing,
      );
      return app.id;
    }
    const rec = await decide(
      reviewer,
      app.id,
      { kind: "recommend", expectedVersion: app.version, comment: "Controls match the set-up." },
      signing,
    );
    app = { id: app.id, version: rec.application.version };
    await decide(
      officer,
      app.id,
      {
        kind: "approve",
        expectedVersion: app.version,
        password,
        confirmedRequirements: requirementIds(tier),
        extraConditions: tier >= 3 ? ["Keep the grounding hook on the bench, within reach of the operator."] : [],
      },
      signing,
    );
    return app.id;
  }

  // A draft, and an application in each waiting state.
  await application(2, "Sphere generator for the open day", {
    kind: "outreach_event",
    audience: "public",
    audienceSize: 120,
  });
  await submitted(1, "Discharge tubes for first-year optics");
  const inReview = await submitted(3, "Long sparks for the electrostatics lecture", { audienceSize: 180 });
  await decide(reviewer, inReview.id, { kind: "recommend", expectedVersion: inReview.version }, signing);
  const returned = await submitted(2, "Sphere generator at the science fair", {
    kind: "outreach_event",
    audience: "public",
    audienceSize: 200,
  });
  await decide(
    reviewer,
    returned.id,
    {
      kind: "return",
      expectedVersion: returned.version,
      comment: "Please state where the audience line is and who holds the grounding hook.",
      pinnedTo: "step:4",
    },
    signing,
  );
  const rejected = await submitted(4, "Can-crushing demonstration in the lecture theatre", { audienceSize: 150 });
  const rec = await decide(reviewer, rejected.id, { kind: "recommend", expectedVersion: rejected.version }, signing);
  await decide(
    officer,
    rejected.id,
    {
      kind: "reject",
      expectedVersion: rec.application.version,
      password,
      comment: "A 10 kJ bank does not run in the lecture theatre. Apply for the high-voltage cell with remote firing.",
    },
    signing,
  );
  const withdrawn = await application(1, "Discharge tubes for the evening lecture");
  await withdrawApplication(instructor, withdrawn.id, withdrawn.version);

  // Permits: active (tiers 0, 1, 3), ending this week (tier 4), expired (tier 3) and revoked (tier 2).
  await approveThrough(0, "Influence machine for the school visit", {
    kind: "outreach_event",
    audience: "public",
    audienceSize: 30,
  });
  await approveThrough(1, "Discharge tubes in the teaching lab", { kind: "teaching_lab" });
  await approveThrough(3, "Jar bank for the spring lecture series", { audienceSize: 180, firstDay: 5, lastDay: 40 });
  const ending = await approveThrough(4, "Pulsed bank research runs", {
    kind: "research_bench",
    audience: "none",
    audienceSize: 0,
    firstDay: 1,
    lastDay: 5,
  });
  const lapsed = await approveThrough(3, "Jar bank for the autumn lecture series", { audienceSize: 160 });
  const revoked = await approveThrough(2, "Sphere generator in the outreach hall", {
    kind: "outreach_event",
    audience: "public",
    audienceSize: 90,
  });

  // Demo dates only: move two validity windows so the dashboard shows a permit ending this week and
  // one that has expired. Real permits get their window from the approving officer. A permit's window
  // is sealed in its approval (lib/records/seal.ts), so the approval is re-dated and re-sealed with
  // it; this runs as the owner role with the key, which the app's role could not do.
  const redate = async (applicationId: string, validFrom: string, validTo: string, expired = false) => {
    await db
      .update(permits)
      .set({ validFrom, validTo, ...(expired ? { state: "expired" as const } : {}) })
      .where(eq(permits.applicationId, applicationId));
    const [approval] = await db
      .select()
      .from(decisions)
      .where(and(eq(decisions.applicationId, applicationId), eq(decisions.kind, "approve")));
    if (approval) {
      const hmac = decisionHmac({ ...approval, validFrom, validTo });
      await db.update(decisions).set({ validFrom, validTo, hmac }).where(eq(decisions.id, approval.id));
    }
  };
  await redate(ending, isoDay(-25), isoDay(4));
  await redate(lapsed, isoDay(-100), isoDay(-10), true);
  const [toRevoke] = await db
    .select({ id: permits.id, version: permits.version })
    .from(permits)
    .where(and(eq(permits.applicationId, revoked), sql`true`));
  await revokePermit(
    officer,
    toRevoke.id,
    {
      expectedVersion: toRevoke.version,
      password,
      reason: "The spark gap was found out of its holder at the pre-use check.",
    },
    signing,
  );
  await writeAudit(db, { actor: null, action: STORY_DONE, entityType: "demo", entityId: "story" });
  return true;
}
