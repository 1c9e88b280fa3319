// The demo story's part for issue 18 (items 2 and 6), for the fictional Aldermere Institute of
// Technology: a responder's account, and set-ups live today in named buildings so the live sheet
// (/live) has something to walk. Goes through the real domain functions (drafts, submission, signed
// decisions) like scripts/demo-story.ts. Run once by scripts/demo-data.ts (marker audit event); invented data.
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { auditEvents, users } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { setupToText } from "@/lib/apparatus/setup-text";
import { createDraft, saveDraft, submitApplication } from "@/lib/applications/actions";
import { applicationDraftSchema } from "@/lib/applications/schemas";
import { currentUserColumns, type CurrentUser } from "@/lib/auth/current-user";
import { hashPassword } from "@/lib/auth/password";
import { assessSetup, requiredControls, type SetupInput } from "@/lib/hazard";
import { decide } from "@/lib/review/decide";
import { tierChain } from "@/lib/rules/chain";
import { currentChainRules } from "@/lib/rules/queries";

const LIVE_DONE = "demo.live_sheet_seeded";
export const RESPONDER_EMAIL = "responder@benchclear.test";
const DAY = 86_400_000;
const isoDay = (offsetDays: number, now = Date.now()) => new Date(now + offsetDays * DAY).toISOString().slice(0, 10);

type DemoSetup = { name: string; setup: SetupInput; tier: 1 | 2 | 3 };

// Values that land in their tier under the default rules (checked when seeding), as in demo-story.ts.
export const DEMO_SETUPS: Record<1 | 2 | 3, DemoSetup> = {
  1: {
    tier: 1,
    name: "Discharge tube supply",
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
    tier: 2,
    name: "Belt-charged sphere generator with spark gap",
    setup: {
      sources: [{ id: "Terminal", kind: "sphere-terminal", radius_m: 0.3 }],
      gaps: [{ sphereDiameter_m: 0.25, spacing_m: 0.08, across: ["Terminal"] }],
    },
  },
  3: {
    tier: 3,
    name: "Bank of jar capacitors",
    setup: {
      sources: [
        { id: "Jar bank", kind: "capacitor", capacitance_F: 5e-9, voltage_V: 25e3, count: 8, bleeder_ohm: 500e6 },
      ],
      gaps: [{ sphereDiameter_m: 0.05, spacing_m: 0.012, across: ["Jar bank"] }],
    },
  },
};

export async function demoUser(email: string): Promise<CurrentUser> {
  const [u] = await getDb().select(currentUserColumns).from(users).where(eq(users.email, email));
  if (!u) throw new Error(`demo user ${email} is missing`);
  return u;
}

/** Draft → submission → the tier's chain of signed decisions; returns the application's id. */
export async function approvedDemoApplication(options: {
  password: string;
  setup: DemoSetup;
  title: string;
  place: string;
  firstDay: string;
  lastDay: string;
  applicant?: string;
}): Promise<string> {
  const applicant = await demoUser(options.applicant ?? "instructor@benchclear.test");
  const reviewer = await demoUser("reviewer@benchclear.test");
  const officer = await demoUser("officer@benchclear.test");
  const tier = assessSetup(options.setup.setup).tier;
  if (tier !== options.setup.tier) throw new Error(`${options.setup.name} assessed as tier ${tier}`);
  const draft = applicationDraftSchema.parse({
    event: {
      title: options.title,
      kind: "lecture_demonstration",
      room: options.place,
      audience: "students",
      audienceSize: "40",
      firstDay: options.firstDay,
      lastDay: options.lastDay,
      responsible: { userId: applicant.id, name: applicant.name, trained: true },
      operators: [{ userId: applicant.id, name: applicant.name, trained: true }],
    },
    apparatus: {
      apparatusId: null,
      apparatusRevisionId: null,
      name: options.setup.name,
      room: options.place,
      notes: "",
      setup: setupToText(options.setup.setup),
    },
    controls: {
      required: requiredControls(tier).map((c) => ({ code: c.id, confirmed: true, note: "" })),
      additional: tier >= 2 ? "Audience seated behind the marked line." : "",
    },
    attestation: { accepted: true },
  });
  const created = await createDraft(applicant, { draft });
  const saved = await saveDraft(applicant, created.id, { expectedVersion: created.version, step: 6, draft });
  const submitted = await submitApplication(applicant, created.id, saved.version);
  const rules = (await currentChainRules()).rules;
  const confirmedRequirements = [
    ...tierChain(rules, tier).requirements.map((r) => r.id),
    ...rules.audience.map((r) => r.id),
  ];
  const signing = { ip: "seed" };
  if (tier === 1) {
    await decide(
      reviewer,
      created.id,
      {
        kind: "approve",
        expectedVersion: submitted.version,
        password: options.password,
        confirmedRequirements,
        extraConditions: [],
      },
      signing,
    );
    return created.id;
  }
  const rec = await decide(reviewer, created.id, { kind: "recommend", expectedVersion: submitted.version }, signing);
  await decide(
    officer,
    created.id,
    {
      kind: "approve",
      expectedVersion: rec.application.version,
      password: options.password,
      confirmedRequirements,
      extraConditions: [],
    },
    signing,
  );
  return created.id;
}

/** The responder's account (no department: it belongs to the emergency services, not a department). */
async function ensureResponder(password: string): Promise<void> {
  await getDb()
    .insert(users)
    .values({
      email: RESPONDER_EMAIL,
      name: "Morgan Ashdown",
      roles: ["responder"],
      departmentId: null,
      passwordHash: await hashPassword(password),
    })
    .onConflictDoNothing();
}

/**
 * Set-ups live today in three named buildings (places written "room, building"), so the live sheet
 * shows its walking order on a fresh start; the story's own permits start later or stand in rooms
 * without a building.
 */
export async function seedLiveSheetDemo(password: string): Promise<boolean> {
  await ensureResponder(password);
  const db = getDb();
  const [done] = await db.select({ id: auditEvents.id }).from(auditEvents).where(eq(auditEvents.action, LIVE_DONE));
  if (done) return false;
  const today = isoDay(0);
  const through = isoDay(3);
  const live = [
    {
      setup: DEMO_SETUPS[3],
      title: "Long sparks for the evening lecture",
      place: "Lecture theatre 2, Faraday Building",
    },
    { setup: DEMO_SETUPS[1], title: "Gas discharge practical", place: "Lab 1.14, Faraday Building" },
    { setup: DEMO_SETUPS[2], title: "Sphere generator at the open laboratory", place: "Foyer, Kelvin Hall" },
  ];
  for (const item of live) {
    await approvedDemoApplication({ password, ...item, firstDay: today, lastDay: through });
  }
  await writeAudit(db, { actor: null, action: LIVE_DONE, entityType: "demo", entityId: "live-sheet" });
  return true;
}
