import { asc, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { apparatus as apparatusTable, apparatusRevisions, auditEvents } from "@/db/schema";
import { assessSetup, type SetupInput } from "@/lib/hazard";
import { createDepartment, createRoleSet, createUser, requireDatabase, uniq } from "../support/db";
import { http, signIn } from "../support/http";

requireDatabase();

/** 4.7 nF at 10 kV: Q = 47 µC > 45 µC and E = 0.235 J < 0.25 J, tier 1 (hazard-model.md table). */
const TIER1: SetupInput = { sources: [{ id: "C1", kind: "capacitor", capacitance_F: 4.7e-9, voltage_V: 10_000 }] };
/** 4.7 nF at 30 kV: E = 2.115 J ≥ 0.25 J, tier 2. */
const TIER2: SetupInput = { sources: [{ id: "C1", kind: "capacitor", capacitance_F: 4.7e-9, voltage_V: 30_000 }] };

async function register(cookie: string, body: Record<string, unknown>) {
  return http("/api/apparatus", { method: "POST", cookie, body });
}

describe("POST /api/apparatus and PATCH /api/apparatus/[id]", () => {
  it("answers a revision assessed by engine 1 without the internal file its sources named", async () => {
    // Engine 1 wrote "(hazard-references §1a)" into every source, a document no reader has. The
    // stored snapshot is kept as it was; GET /api/apparatus/[id] drops the pointer, keeping the publication.
    const set = await createRoleSet();
    const cookie = await signIn(set.instructor.email);
    const created = await register(cookie, { name: "Jar pair, engine 1", room: "B12", notes: "", setup: TIER2 });
    expect(created.status, created.text).toBe(201);
    const id = created.json!.apparatus.id;
    const fresh = assessSetup(TIER2);
    const old = {
      ...fresh,
      engineVersion: "1.2.0",
      reasons: fresh.reasons.map(({ ref: _ref, ...r }) => ({
        ...r,
        source: "LBNL Electrical Safety Manual, Table 2.2.13 (hazard-references §1a)",
      })),
      flags: fresh.flags.map(({ ref: _ref, ...f }) => ({
        ...f,
        source: "capacitor discharge guideline (hazard-references §1c)",
      })),
    };
    await getDb().update(apparatusRevisions).set({ assessment: old }).where(eq(apparatusRevisions.apparatusId, id));
    const detail = await http(`/api/apparatus/${id}`, { cookie });
    expect(detail.status, detail.text).toBe(200);
    const text = JSON.stringify(detail.json!.apparatus.current.assessment);
    expect(text).not.toMatch(/hazard-references|§/);
    expect(text).toContain("LBNL Electrical Safety Manual, Table 2.2.13");
    // the stored snapshot itself is unchanged
    const [row] = await getDb()
      .select({ assessment: apparatusRevisions.assessment })
      .from(apparatusRevisions)
      .where(eq(apparatusRevisions.apparatusId, id));
    expect(JSON.stringify(row.assessment)).toContain("hazard-references §1a");
  });

  it("stores a figure that looks mistyped once the form has had it confirmed: the server does not refuse it", async () => {
    // 200 mΩ across a 40 kV bank would dissipate (40 kV)² / 0.2 Ω = 8 GW: the engine flags it as
    // implausible and the form asks the user to confirm; an unusual part can be real, so the API
    // stores it, with the flag in the stored assessment.
    const set = await createRoleSet();
    const cookie = await signIn(set.instructor.email);
    const setup: SetupInput = {
      sources: [{ id: "bank", kind: "capacitor", capacitance_F: 1e-6, voltage_V: 40_000, bleeder_ohm: 0.2 }],
    };
    const created = await register(cookie, { name: "Bank with a low bleeder", room: "B12", notes: "", setup });
    expect(created.status, created.text).toBe(201);
    const [row] = await getDb()
      .select({ assessment: apparatusRevisions.assessment })
      .from(apparatusRevisions)
      .where(eq(apparatusRevisions.apparatusId, created.json!.apparatus.id));
    const flags = (row.assessment as { flags: { code: string; field?: string }[] }).flags;
    expect(flags).toContainEqual(expect.objectContaining({ code: "implausible", field: "sources[0].bleeder_ohm" }));
  });

  it("registers revision 1 with the engine's assessment, and every edit adds a revision", async () => {
    const set = await createRoleSet();
    const cookie = await signIn(set.instructor.email);
    const created = await register(cookie, { name: "Leyden jar pair", room: "B12", notes: "Two jars.", setup: TIER1 });
    expect(created.status, created.text).toBe(201);
    const id = created.json!.apparatus.id;
    expect(created.json!.apparatus).toMatchObject({ revision: 1, tier: 1 });

    const edited = await http(`/api/apparatus/${id}`, {
      method: "PATCH",
      cookie,
      body: { name: "Leyden jar pair", room: "B14", notes: "Moved.", setup: TIER2, expectedRevision: 1 },
    });
    expect(edited.status, edited.text).toBe(200);
    expect(edited.json!.apparatus).toMatchObject({ revision: 2, tier: 2 });

    const stale = await http(`/api/apparatus/${id}`, {
      method: "PATCH",
      cookie,
      body: { name: "Leyden jar pair", room: "B15", notes: "", setup: TIER1, expectedRevision: 1 },
    });
    expect(stale.status).toBe(409);

    const revisions = await getDb()
      .select()
      .from(apparatusRevisions)
      .where(eq(apparatusRevisions.apparatusId, id))
      .orderBy(asc(apparatusRevisions.revision));
    expect(revisions.map((r) => [r.revision, r.room, r.tier])).toEqual([
      [1, "B12", 1],
      [2, "B14", 2],
    ]);
    // Each revision keeps the assessment the engine gave its own set-up.
    expect(revisions[0].assessment).toEqual(assessSetup(TIER1));
    expect(revisions[1].assessment).toEqual(assessSetup(TIER2));
    const [row] = await getDb().select().from(apparatusTable).where(eq(apparatusTable.id, id));
    expect(row).toMatchObject({
      currentRevision: 2,
      tier: 2,
      room: "B14",
      departmentId: set.dept.id,
      ownerId: set.instructor.id,
    });
    expect(row.energy_J).toBeCloseTo(2.115, 10); // ½ · 4.7 nF · (30 kV)²

    const detail = await http(`/api/apparatus/${id}`, { cookie });
    expect(detail.status).toBe(200);
    expect(detail.json!.apparatus.current.revision).toBe(2);
    expect(detail.json!.apparatus.current.assessment.tier).toBe(2);
    expect(detail.json!.apparatus.revisions.map((r: { revision: number }) => r.revision)).toEqual([2, 1]);
    expect(detail.json!.apparatus.canEdit).toBe(true);

    const audit = await getDb().select().from(auditEvents).where(eq(auditEvents.entityId, id));
    expect(audit.map((a) => a.action).sort()).toEqual(["apparatus.created", "apparatus.revised"]);
  });

  it("refuses a set-up the engine refuses with 422 naming the field", async () => {
    const set = await createRoleSet();
    const cookie = await signIn(set.instructor.email);
    const res = await register(cookie, {
      name: "Broken bank",
      room: "B12",
      notes: "",
      setup: { sources: [{ kind: "capacitor", capacitance_F: -1, voltage_V: 100 }] },
    });
    expect(res.status).toBe(422);
    expect(res.json!.error.issues[0].path).toBe("setup.sources[0].capacitance_F");
    const series = await register(cookie, {
      name: "Series of one",
      room: "B12",
      notes: "",
      setup: { sources: [{ kind: "capacitor", capacitance_F: 1e-9, voltage_V: 100, arrangement: "series", count: 1 }] },
    });
    expect(series.status).toBe(422);
    expect(series.json!.error.issues[0].path).toBe("setup.sources[0].count");
    const noName = await register(cookie, { name: " ", room: "B12", setup: TIER1 });
    expect(noName.status).toBe(422);
    expect(noName.json!.error.issues[0].path).toBe("name");
  });

  it("lets the department read and edit, officers read, and keeps everyone else out", async () => {
    const set = await createRoleSet();
    const ownerCookie = await signIn(set.instructor.email);
    const id = (await register(ownerCookie, { name: "Induction coil", room: "C3", notes: "", setup: TIER1 })).json!
      .apparatus.id;
    const body = (expectedRevision: number) => ({
      name: "Induction coil",
      room: "C3",
      notes: "",
      setup: TIER1,
      expectedRevision,
    });

    const colleague = await createUser({ roles: ["instructor"], departmentId: set.dept.id });
    const stranger = await createUser({ roles: ["instructor"], departmentId: (await createDepartment()).id });
    const cookies = {
      reviewer: await signIn(set.reviewer.email),
      officer: await signIn(set.safety_officer.email),
      admin: await signIn(set.admin.email),
      colleague: await signIn(colleague.email),
      stranger: await signIn(stranger.email),
    };
    expect((await http(`/api/apparatus/${id}`, { cookie: cookies.reviewer })).status).toBe(200);
    expect((await http(`/api/apparatus/${id}`, { cookie: cookies.officer })).status).toBe(200);
    expect((await http(`/api/apparatus/${id}`, { cookie: cookies.stranger })).status).toBe(404);
    // The admin (another department, no apparatus.write) reads nothing of this department's.
    expect((await http(`/api/apparatus/${id}`, { cookie: cookies.admin })).status).toBe(404);

    const byColleague = await http(`/api/apparatus/${id}`, {
      method: "PATCH",
      cookie: cookies.colleague,
      body: body(1),
    });
    expect(byColleague.status, byColleague.text).toBe(200);
    expect(
      (await http(`/api/apparatus/${id}`, { method: "PATCH", cookie: cookies.officer, body: body(2) })).status,
    ).toBe(403);
    expect(
      (await http(`/api/apparatus/${id}`, { method: "PATCH", cookie: cookies.stranger, body: body(2) })).status,
    ).toBe(404);
    expect((await http(`/api/apparatus/${id}`, { method: "PATCH", cookie: cookies.admin, body: body(2) })).status).toBe(
      403,
    );
    expect((await http(`/api/apparatus/not-an-id`, { cookie: ownerCookie })).status).toBe(404);
  });
});

describe("GET /api/apparatus", () => {
  it("pages, sorts and filters on the server, within what the user may read", async () => {
    const set = await createRoleSet();
    const cookie = await signIn(set.instructor.email);
    const tag = uniq("kit");
    // Energies ½·C·V² at 10 kV for C = 1…7 nF: 0.05 J … 0.35 J.
    for (let n = 1; n <= 7; n++) {
      const res = await register(cookie, {
        name: `${tag} bank ${n}`,
        room: n % 2 ? "B12" : "Annex Z9",
        notes: "",
        setup: { sources: [{ kind: "capacitor", capacitance_F: n * 1e-9, voltage_V: 10_000 }] },
      });
      expect(res.status).toBe(201);
    }
    const list = (query: string) => http(`/api/apparatus?q=${tag}&${query}`, { cookie });

    const page1 = await list("sort=energy&dir=asc&pageSize=5");
    expect(page1.status).toBe(200);
    expect(page1.json!.total).toBe(7);
    expect(page1.json!.rows.map((r: { name: string }) => r.name)).toEqual(
      [1, 2, 3, 4, 5].map((n) => `${tag} bank ${n}`),
    );
    const page2 = await list("sort=energy&dir=asc&pageSize=5&page=2");
    expect(page2.json!.rows.map((r: { name: string }) => r.name)).toEqual([`${tag} bank 6`, `${tag} bank 7`]);
    const byEnergyDesc = await list("sort=energy&dir=desc&pageSize=5");
    expect(byEnergyDesc.json!.rows[0].energy_J).toBeCloseTo(0.35, 10);

    // C ≤ 4 nF at 10 kV holds at most 40 µC (within the 45 µC level: tier 0); 5 nF holds 50 µC and
    // 0.25 J (tier 2); so tier 2 is banks 5, 6 and 7.
    const tier2 = await list("tier=2&sort=name&dir=asc");
    expect(tier2.json!.rows.map((r: { name: string }) => r.name)).toEqual([5, 6, 7].map((n) => `${tag} bank ${n}`));
    // The tag is hex, so "annex" matches only the room.
    const inAnnex = await http(`/api/apparatus?q=annex&owner=mine&pageSize=100`, { cookie });
    expect(inAnnex.json!.rows.every((r: { room: string }) => r.room === "Annex Z9")).toBe(true);
    expect(inAnnex.json!.total).toBe(3);

    const bad = await http("/api/apparatus?sort=colour&tier=9", { cookie });
    expect(bad.status).toBe(422);
    expect(bad.json!.error.issues.map((i: { path: string }) => i.path).sort()).toEqual(["sort", "tier"]);

    const stranger = await createUser({ roles: ["instructor"], departmentId: (await createDepartment()).id });
    const theirs = await http(`/api/apparatus?q=${tag}`, { cookie: await signIn(stranger.email) });
    expect(theirs.json!.total).toBe(0);
    const officer = await http(`/api/apparatus?q=${tag}`, { cookie: await signIn(set.safety_officer.email) });
    expect(officer.json!.total).toBe(7);
  });
});
