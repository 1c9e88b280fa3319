// Demo data for the fictional Aldermere Institute of Technology: two departments, one user per role
// (the demo password is printed in the README), the institution's settings, and the demo story
// (scripts/demo-story.ts: apparatus of every tier, applications in every state, permits). Idempotent:
// re-running adds only what is missing. Refuses NODE_ENV=production, and any database not on this
// machine, unless SEED_ALLOW_PRODUCTION=1 (seedRefusal below).
import "@/lib/jobs/standalone";
import { DEMO_PASSWORD } from "@/lib/auth/demo";
import { hashPassword } from "@/lib/auth/password";
import { isLoopbackHost } from "@/lib/env";
import { loadLocalEnv } from "@/scripts/lib/load-env";
import { closeDb, getDb } from "@/db";
import { departments, institutionSettings, users, type Role } from "@/db/schema";
import { eq } from "drizzle-orm";

export { DEMO_PASSWORD };
export const INSTITUTION_NAME = "Aldermere Institute of Technology";

export const DEMO_DEPARTMENTS = [
  { code: "PHYS", name: "Department of Physics" },
  { code: "OUTR", name: "Science Outreach Centre" },
] as const;

export const DEMO_USERS: { email: string; name: string; roles: Role[]; department: string }[] = [
  { email: "instructor@benchclear.test", name: "Imogen Tallis", roles: ["instructor"], department: "PHYS" },
  { email: "reviewer@benchclear.test", name: "Rafael Quenby", roles: ["reviewer"], department: "PHYS" },
  { email: "officer@benchclear.test", name: "Dana Whitlock", roles: ["safety_officer"], department: "OUTR" },
  { email: "admin@benchclear.test", name: "Sam Ferreira", roles: ["admin"], department: "OUTR" },
];

/**
 * Why the demo data (accounts with a published password) must not go into this database, or null.
 * `npm start` runs this script with NODE_ENV=development whatever it points at, so the database's
 * host is checked too: only a cluster on this machine (loopback or a local socket) gets demo data.
 */
export function seedRefusal(source: Record<string, string | undefined>): string | null {
  if (source.SEED_ALLOW_PRODUCTION === "1") return null;
  if (source.NODE_ENV === "production") return "NODE_ENV=production";
  let host = "";
  try {
    const url = new URL(source.DATABASE_URL ?? "");
    host = decodeURIComponent(url.hostname) || url.searchParams.get("host") || "";
  } catch {
    return "DATABASE_URL is not a URL";
  }
  if (host && !host.startsWith("/") && !isLoopbackHost(host)) return `the database is not on this machine (${host})`;
  return null;
}

export async function seed(): Promise<void> {
  const db = getDb();
  await db
    .insert(departments)
    .values([...DEMO_DEPARTMENTS])
    .onConflictDoNothing();
  const depts = await db.select({ id: departments.id, code: departments.code }).from(departments);
  const deptId = new Map(depts.map((d) => [d.code, d.id]));

  const existing = await db.select({ email: users.email }).from(users);
  const have = new Set(existing.map((u) => u.email.toLowerCase()));
  const missing = DEMO_USERS.filter((u) => !have.has(u.email));
  if (missing.length > 0) {
    const passwordHash = await hashPassword(DEMO_PASSWORD);
    await db
      .insert(users)
      .values(
        missing.map((u) => ({
          email: u.email,
          name: u.name,
          roles: u.roles,
          departmentId: deptId.get(u.department),
          passwordHash,
        })),
      )
      .onConflictDoNothing();
  }
  await db
    .insert(institutionSettings)
    .values({
      id: 1,
      name: INSTITUTION_NAME,
      timeZone: "UTC",
      emergencyContacts: [
        { label: "Emergency services", phone: "112" },
        { label: "Campus security (24 h)", phone: "+1 555 0100" },
        { label: "Safety office", phone: "+1 555 0142" },
      ],
    })
    .onConflictDoNothing();

  // The story goes through server modules; they load only after lib/jobs/standalone is registered.
  const { seedStory } = await import("./demo-story");
  const told = await seedStory(DEMO_PASSWORD);
  await demoPreUseChecks();
  console.log(
    `  demo data: ${DEMO_DEPARTMENTS.length} departments, ${missing.length} user(s) added, story ${told ? "added" : "already there"}`,
  );
  await demoApparatusChange();
  await demoTraining();
  await demoIncidents();
  await demoUpkeep();
  await seedLiveAndReportDemo();
}

/**
 * Training records (issue 17, item 1): two course types required institution-wide — "High-voltage
 * awareness", 36 months, from tier 2, and "Capacitor-bank operator", 24 months, from tier 3 — and the
 * instructor's record: awareness taken 14 months ago (current), the capacitor-bank course 24 months
 * less 10 days ago, so it lapses in 10 days (a reminder is due; active tier 3–4 permits running past
 * that day are flagged). Runs after the story, whose approvals predate the requirements. Idempotent:
 * nothing is added once the course types exist.
 */
async function demoTraining(): Promise<void> {
  const db = getDb();
  const { courseTypes } = await import("@/db/schema");
  const { currentUserColumns } = await import("@/lib/auth/current-user");
  const { createCourseType, recordTraining } = await import("@/lib/training/actions");
  const existing = await db.select({ id: courseTypes.id }).from(courseTypes).limit(1);
  if (existing.length > 0) return;
  const actor = async (email: string) => {
    const [row] = await db.select(currentUserColumns).from(users).where(eq(users.email, email));
    return row;
  };
  const [admin, officer, instructor] = await Promise.all([
    actor("admin@benchclear.test"),
    actor("officer@benchclear.test"),
    actor("instructor@benchclear.test"),
  ]);
  if (!admin || !officer || !instructor) return;
  const awareness = await createCourseType(admin, {
    name: "High-voltage awareness",
    covers: "Stored energy and charge, approach distances, grounding hooks and how to discharge a set-up.",
    validityMonths: 36,
    minTier: 2,
    departmentId: null,
  });
  const bank = await createCourseType(admin, {
    name: "Capacitor-bank operator",
    covers: "Charging, bleeding and shorting a capacitor bank; triggered gaps; the interlocked enclosure.",
    validityMonths: 24,
    minTier: 3,
    departmentId: null,
  });
  const monthsAgo = (months: number, plusDays = 0) => {
    const now = new Date();
    return new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - months, now.getUTCDate() + plusDays))
      .toISOString()
      .slice(0, 10);
  };
  await recordTraining(officer, {
    userId: instructor.id,
    courseTypeId: awareness.id,
    completedOn: monthsAgo(14),
    trainer: "Aldermere safety office",
  });
  await recordTraining(officer, {
    userId: instructor.id,
    courseTypeId: bank.id,
    completedOn: monthsAgo(24, 10),
    trainer: "Aldermere pulsed-power laboratory",
  });
  console.log("  demo data: course types and training records added (one course lapses in 10 days)");
}

/**
 * Re-review (issue 17, item 4): the discharge-tube supply under the active teaching-lab permit is
 * replaced by a stronger one — 10 kV with 10 nF of output capacitance, ½ × 10 nF × (10 kV)² = 0.5 J,
 * tier 2 where the permit was approved at tier 1 — so the permit page and the instructor's dashboard
 * show "apparatus changed since approval", and the holder and the officer have an e-mail. Once only.
 */
async function demoApparatusChange(): Promise<void> {
  const MARK = "demo.apparatus_change_seeded";
  const { and, eq } = await import("drizzle-orm");
  const { apparatus, apparatusRevisions, auditEvents } = await import("@/db/schema");
  const { currentUserColumns } = await import("@/lib/auth/current-user");
  const { writeAudit } = await import("@/lib/audit");
  const { reviseApparatus } = await import("@/lib/rereview/actions");
  const db = getDb();
  const [done] = await db.select({ id: auditEvents.id }).from(auditEvents).where(eq(auditEvents.action, MARK));
  if (done) return;
  const [owner] = await db.select(currentUserColumns).from(users).where(eq(users.email, "instructor@benchclear.test"));
  const [record] = owner
    ? await db
        .select({ id: apparatus.id, revision: apparatus.currentRevision, setup: apparatusRevisions.setup })
        .from(apparatus)
        .innerJoin(
          apparatusRevisions,
          and(
            eq(apparatusRevisions.apparatusId, apparatus.id),
            eq(apparatusRevisions.revision, apparatus.currentRevision),
          ),
        )
        .where(and(eq(apparatus.ownerId, owner.id), eq(apparatus.name, "Discharge tube supply")))
    : [];
  if (!owner || !record) return;
  const saved = await reviseApparatus(owner, record.id, {
    name: "Discharge tube supply",
    room: "C04 teaching lab",
    notes: "Replaced by the 10 kV supply from the stores; larger output capacitor, same tubes.",
    setup: {
      sources: [
        {
          id: "Supply",
          kind: "dc-supply",
          voltage_V: 10_000,
          currentLimit_A: 10e-3,
          seriesResistance_ohm: 100e3,
          outputCapacitance_F: 10e-9,
        },
      ],
      vacuumDevice: true,
    },
    expectedRevision: record.revision,
  });
  await writeAudit(db, { actor: null, action: MARK, entityType: "demo", entityId: "apparatus-change" });
  console.log(`  demo data: apparatus changed under ${saved.permitsFlagged.length} active permit(s)`);
}

/**
 * Pre-use checks recorded at the bench (issue 17): on the tier 4 permit that ends this week, one
 * check nine days ago with everything in order and one eight days ago with a "no" (the holder and the
 * safety officer are e-mailed), so the officer's dashboard lists it as not checked lately; on the
 * tier 1 teaching-lab permit, one check today. Recorded through the real action with fixed
 * idempotency keys, so running this again records nothing twice.
 */
async function demoPreUseChecks(): Promise<void> {
  const { eq } = await import("drizzle-orm");
  const { applications, permits } = await import("@/db/schema");
  const { currentUserColumns } = await import("@/lib/auth/current-user");
  const { recordCheck } = await import("@/lib/checks/actions");
  const { checkTarget } = await import("@/lib/checks/queries");
  const db = getDb();
  const [holder] = await db.select(currentUserColumns).from(users).where(eq(users.email, "instructor@benchclear.test"));
  if (!holder) return;
  const permitOf = async (title: string) => {
    const [row] = await db
      .select({ id: permits.id })
      .from(permits)
      .innerJoin(applications, eq(applications.id, permits.applicationId))
      .where(eq(applications.title, title))
      .limit(1);
    return row?.id ?? null;
  };
  const DAY_MS = 86_400_000;
  const record = async (
    permitId: string | null,
    key: string,
    daysAgo: number,
    answers: Record<string, { answer: "no" | "na"; note: string }> = {},
  ) => {
    if (!permitId) return;
    const when = new Date(Date.now() - daysAgo * DAY_MS);
    const target = await checkTarget(holder, permitId, when);
    if (!target?.inUse) return;
    const items = target.checklist.map((item) => ({
      id: item.id,
      answer: answers[item.id]?.answer ?? ("yes" as const),
      note: answers[item.id]?.note ?? "",
      photoId: null,
    }));
    await recordCheck(holder, permitId, { idempotencyKey: key, items, note: "" }, when);
  };
  const bank = await permitOf("Pulsed bank research runs");
  await record(bank, "3b0c7c52-5d0e-4c61-9a4e-0d1f00000001", 9);
  await record(bank, "3b0c7c52-5d0e-4c61-9a4e-0d1f00000002", 8, {
    "control:interlock-or-remote": {
      answer: "no",
      note: "The enclosure door switch sticks closed; runs held until it is replaced.",
    },
    "control:eye-hearing-protection": { answer: "na", note: "Remote firing only today; nobody inside the cell." },
  });
  await record(await permitOf("Discharge tubes in the teaching lab"), "3b0c7c52-5d0e-4c61-9a4e-0d1f00000003", 0);
}

/**
 * Incident reports (issue 17, item 3): a near miss at the jar bank under the instructor's active
 * permit (reported by the reviewer, under investigation), and a small shock from the tabletop
 * influence machine (reported by the instructor, closed with findings and actions). Once only.
 */
async function demoIncidents(): Promise<void> {
  const MARK = "demo.incidents_seeded";
  const { and, desc, eq } = await import("drizzle-orm");
  const { apparatus, auditEvents, permits } = await import("@/db/schema");
  const { currentUserColumns } = await import("@/lib/auth/current-user");
  const { writeAudit } = await import("@/lib/audit");
  const { reportIncident, triageIncident } = await import("@/lib/incidents/actions");
  const { incidentReportSchema } = await import("@/lib/incidents/schemas");
  const db = getDb();
  const [done] = await db.select({ id: auditEvents.id }).from(auditEvents).where(eq(auditEvents.action, MARK));
  if (done) return;
  const person = async (email: string) =>
    (await db.select(currentUserColumns).from(users).where(eq(users.email, email)))[0];
  const [instructor, reviewer, officer] = await Promise.all([
    person("instructor@benchclear.test"),
    person("reviewer@benchclear.test"),
    person("officer@benchclear.test"),
  ]);
  if (!instructor || !reviewer || !officer) return;
  const [permit] = await db
    .select({ id: permits.id })
    .from(permits)
    .where(and(eq(permits.holderId, instructor.id), eq(permits.state, "active")))
    .orderBy(desc(permits.tier), desc(permits.validTo))
    .limit(1);
  const [machine] = await db
    .select({ id: apparatus.id })
    .from(apparatus)
    .where(and(eq(apparatus.ownerId, instructor.id), eq(apparatus.name, "Tabletop influence machine")));
  const hoursAgo = (h: number) => new Date(Date.now() - h * 3_600_000).toISOString();

  const nearMiss = await reportIncident(
    reviewer,
    incidentReportSchema.parse({
      kind: "near_miss",
      summary: "Jar bank found charged an hour after the show",
      description:
        "Tidying the bench after the evening demonstration, I held the grounding hook to the bank out of habit and it drew a loud spark. Nobody had touched the jars. The bleeder should have brought them down within minutes.",
      occurredAt: hoursAgo(30),
      location: "B12 lecture theatre, demonstration bench",
      injuries: false,
      permitId: permit?.id ?? null,
    }),
  );
  await triageIncident(officer, nearMiss.id, {
    expectedVersion: nearMiss.version,
    state: "investigating",
    findings: "The bleeder's lead is loose at the bank's terminal; measuring it today.",
    actions: "",
  });

  const shock = await reportIncident(
    instructor,
    incidentReportSchema.parse({
      kind: "incident",
      summary: "Small shock from the influence machine's jar",
      description:
        "While moving the tabletop influence machine after a class, my knuckle touched the outer foil of a jar. A sharp sting, no mark.",
      occurredAt: hoursAgo(24 * 9),
      location: "B12 preparation room",
      injuries: true,
      injuryNote: "A sting to the right knuckle; no burn, no first aid needed.",
      apparatusId: machine?.id ?? null,
    }),
  );
  const opened = await triageIncident(officer, shock.id, {
    expectedVersion: shock.version,
    state: "investigating",
    findings: "",
    actions: "",
  });
  await triageIncident(officer, shock.id, {
    expectedVersion: opened.incident.version,
    state: "closed",
    findings:
      "The jars keep a residual charge after the discharge rod is removed; the machine was moved before grounding.",
    actions:
      "Jars shorted with the grounding hook before the machine is moved; a note on the machine says so. The machine is retired.",
  });
  await writeAudit(db, { actor: null, action: MARK, entityType: "demo", entityId: "incidents" });
  console.log("  demo data: two incident reports (one under a permit)");
}

/**
 * Apparatus upkeep (issue 17, item 5): inspection records on the jar bank (every 90 days, all passed
 * last month), the pulsed bank overdue (every 30 days, last passed 40 days ago, a failed hook check
 * since), and the tabletop influence machine retired. Once only.
 */
async function demoUpkeep(): Promise<void> {
  const MARK = "demo.upkeep_seeded";
  const { and, eq } = await import("drizzle-orm");
  const { apparatus, auditEvents } = await import("@/db/schema");
  const { currentUserColumns } = await import("@/lib/auth/current-user");
  const { writeAudit } = await import("@/lib/audit");
  const { recordInspection, retireApparatus, setInspectionInterval } = await import("@/lib/upkeep/actions");
  const db = getDb();
  const [done] = await db.select({ id: auditEvents.id }).from(auditEvents).where(eq(auditEvents.action, MARK));
  if (done) return;
  const [owner] = await db.select(currentUserColumns).from(users).where(eq(users.email, "instructor@benchclear.test"));
  if (!owner) return;
  const byName = async (name: string) =>
    (
      await db
        .select({ id: apparatus.id })
        .from(apparatus)
        .where(and(eq(apparatus.ownerId, owner.id), eq(apparatus.name, name)))
    )[0]?.id;
  const day = (daysAgo: number) => new Date(Date.now() - daysAgo * 86_400_000).toISOString().slice(0, 10);
  const jars = await byName("Bank of jar capacitors");
  const pulsed = await byName("Pulsed capacitor bank");
  const machine = await byName("Tabletop influence machine");
  if (jars) {
    await setInspectionInterval(owner, jars, { inspectionInterval_days: 90 });
    const by = owner.name;
    await recordInspection(owner, jars, {
      kind: "bleeder",
      inspectedOn: day(28),
      inspectedBy: by,
      result: "pass",
      note: "500 MΩ bleeder measured at 498 MΩ; the bank fell below 50 V in 40 s from 25 kV.",
    });
    await recordInspection(owner, jars, {
      kind: "jars_insulation",
      inspectedOn: day(28),
      inspectedBy: by,
      result: "pass",
      note: "No crazing on the eight jars; stand insulation clean and dry.",
    });
    await recordInspection(owner, jars, {
      kind: "grounding_hook",
      inspectedOn: day(28),
      inspectedBy: by,
      result: "repaired",
      note: "Braid frayed at the clamp; re-terminated and checked for continuity.",
    });
  }
  if (pulsed) {
    await setInspectionInterval(owner, pulsed, { inspectionInterval_days: 30 });
    await recordInspection(owner, pulsed, {
      kind: "maintenance",
      inspectedOn: day(40),
      inspectedBy: "Opal Fenwick",
      result: "pass",
      note: "Trigger gap electrodes cleaned; interlock tested.",
    });
    await recordInspection(owner, pulsed, {
      kind: "grounding_hook",
      inspectedOn: day(5),
      inspectedBy: "Opal Fenwick",
      result: "fail",
      note: "Hook's earth lead missing; the bank is not to be charged until it is replaced.",
    });
  }
  if (machine) {
    await retireApparatus(owner, machine, {
      reason: "Jars keep a residual charge and the base is cracked; replaced by the new outreach machine.",
    });
  }
  await writeAudit(db, { actor: null, action: MARK, entityType: "demo", entityId: "upkeep" });
  console.log("  demo data: inspection records on two apparatus, one apparatus retired");
}

/** Issue 18: the responder's account and set-ups live today (/live); scripts/demo-live-report.ts. */
async function seedLiveAndReportDemo(): Promise<void> {
  const { seedLiveSheetDemo } = await import("./demo-live-report");
  const live = await seedLiveSheetDemo(DEMO_PASSWORD);
  if (live) console.log("  demo data: a responder's account and three set-ups live today");
}

if (import.meta.url === `file://${process.argv[1]}`) {
  loadLocalEnv();
  const refusal = seedRefusal(process.env);
  if (refusal) {
    console.error(`Refusing to add demo data: ${refusal} (set SEED_ALLOW_PRODUCTION=1 to insist).`);
    process.exit(1);
  }
  seed()
    .catch((error: unknown) => {
      console.error("seed failed:", error instanceof Error ? error.message : error);
      process.exitCode = 1;
    })
    .finally(() => closeDb());
}
