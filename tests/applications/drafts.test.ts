import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applications, auditEvents } from "@/db/schema";
import { assessSetup } from "@/lib/hazard";
import { createDepartment, createUser, requireDatabase } from "../support/db";
import { http, signIn } from "../support/http";
import {
  completeDraft,
  createDraft,
  getDraft,
  instructorWithReviewer,
  saveDraft,
  setupOf,
  signedInInstructor,
  TIER1_SETUP_TEXT,
  TIER2_SETUP_TEXT,
} from "./support";

requireDatabase();

describe("POST /api/applications, GET and PATCH /api/applications/[id]/draft", () => {
  it("creates a draft naming the applicant as responsible, saves it, and resumes at the saved step", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const created = await createDraft(cookie);
    expect(created.version).toBe(1);

    const first = await getDraft(cookie, created.id);
    expect(first.status).toBe(200);
    expect(first.json!.application).toMatchObject({ state: "draft", editable: true, version: 1, step: 1 });
    expect(first.json!.application.draft.event.responsible).toEqual({
      userId: instructor.id,
      name: instructor.name,
      trained: false,
    });

    const draft = completeDraft(instructor);
    const saved = await saveDraft(cookie, created.id, 1, draft, 3);
    expect(saved.status, saved.text).toBe(200);
    expect(saved.json!.application.version).toBe(2);
    // The server's live tier is the engine's: 4.7 nF at 30 kV holds 2.115 J, tier 2 (hazard-model.md).
    expect(saved.json!.application.tier).toBe(assessSetup(setupOf(TIER2_SETUP_TEXT)).tier);
    expect(saved.json!.application.tier).toBe(2);

    const resumed = await getDraft(cookie, created.id);
    expect(resumed.json!.application.step).toBe(3);
    expect(resumed.json!.application.version).toBe(2);
    expect(resumed.json!.application.draft).toEqual(draft);

    const [row] = await getDb().select().from(applications).where(eq(applications.id, created.id));
    expect(row.title).toBe(draft.event.title);
    expect(row.namedUserIds).toEqual([instructor.id]);
    expect(row.departmentId).toBe(instructor.departmentId);
    const audit = await getDb()
      .select({ action: auditEvents.action })
      .from(auditEvents)
      .where(eq(auditEvents.entityId, created.id));
    expect(audit.map((a) => a.action)).toEqual(
      expect.arrayContaining(["application.draft_created", "application.draft_saved"]),
    );
  });

  it("keeps text that does not read yet (a half-typed quantity) and reports no tier for it", async () => {
    const { cookie } = await instructorWithReviewer();
    const created = await createDraft(cookie);
    const draft = {
      apparatus: {
        setup: { sources: [{ label: "C1", kind: "capacitor", capacitance_F: "4.7 n", voltage_V: "30 kV" }] },
      },
    };
    const saved = await saveDraft(cookie, created.id, 1, draft, 2);
    expect(saved.status, saved.text).toBe(200);
    expect(saved.json!.application.tier).toBeNull();
    const resumed = await getDraft(cookie, created.id);
    expect(resumed.json!.application.draft.apparatus.setup.sources[0].capacitance_F).toBe("4.7 n");
  });

  it("answers 409 to a save from a stale version and keeps the newer draft", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const created = await createDraft(cookie);
    const newer = completeDraft(instructor, { title: "Saved from the first window" });
    expect((await saveDraft(cookie, created.id, 1, newer)).status).toBe(200);

    const stale = await saveDraft(
      cookie,
      created.id,
      1,
      completeDraft(instructor, { title: "From the second window" }),
    );
    expect(stale.status).toBe(409);
    expect(stale.json!.error.message).toMatch(/saved elsewhere/);
    const kept = await getDraft(cookie, created.id);
    expect(kept.json!.application.draft.event.title).toBe("Saved from the first window");
    expect(kept.json!.application.version).toBe(2);
  });

  it("refuses a malformed draft with 422 naming the field, and the saved draft stays as it was", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const created = await createDraft(cookie);
    const good = completeDraft(instructor);
    expect((await saveDraft(cookie, created.id, 1, good)).status).toBe(200);

    const bad = await saveDraft(cookie, created.id, 2, { ...good, event: { ...good.event, kind: "rave" } });
    expect(bad.status).toBe(422);
    expect(bad.json!.error.issues[0].path).toBe("draft.event.kind");
    const tooLong = await saveDraft(cookie, created.id, 2, {
      ...good,
      apparatus: {
        ...good.apparatus,
        setup: { ...good.apparatus.setup, sources: [{ kind: "capacitor", voltage_V: "9".repeat(61) }] },
      },
    });
    expect(tooLong.status).toBe(422);
    expect(tooLong.json!.error.issues[0].path).toBe("draft.apparatus.setup.sources[0].voltage_V");

    // A version beyond PostgreSQL's integer range is refused before it reaches SQL (never a 500).
    const huge = await saveDraft(cookie, created.id, 2 ** 40, good);
    expect(huge.status).toBe(422);
    expect(huge.json!.error.issues[0].path).toBe("expectedVersion");

    const kept = await getDraft(cookie, created.id);
    expect(kept.json!.application.draft).toEqual(good);
  });

  it("answers 404 to anyone but the applicant, for reading and for saving", async () => {
    const { instructor, reviewer, cookie } = await instructorWithReviewer();
    const created = await createDraft(cookie);
    const other = await signedInInstructor(instructor.departmentId);
    const reviewerCookie = await signIn(reviewer.email);
    for (const who of [other.cookie, reviewerCookie]) {
      expect((await getDraft(who, created.id)).status).toBe(404);
      expect((await saveDraft(who, created.id, 1, completeDraft(instructor))).status).toBe(404);
    }
    expect((await getDraft(cookie, "not-a-uuid")).status).toBe(404);
    expect((await getDraft(undefined as unknown as string, created.id)).status).toBe(401);
  });

  it("starts a draft from a registry apparatus with its current revision, and refuses one from another department", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const made = await http("/api/apparatus", {
      method: "POST",
      cookie,
      body: {
        name: "Belt-charged sphere generator",
        room: "B12",
        notes: "",
        setup: setupOf(TIER1_SETUP_TEXT),
      },
    });
    expect(made.status, made.text).toBe(201);
    const apparatus = made.json!.apparatus;
    const created = await createDraft(cookie, { apparatusId: apparatus.id });
    const draft = (await getDraft(cookie, created.id)).json!.application.draft;
    expect(draft.apparatus).toMatchObject({
      apparatusId: apparatus.id,
      apparatusRevisionId: apparatus.revisionId,
      name: "Belt-charged sphere generator",
    });
    expect(draft.apparatus.setup.sources[0]).toMatchObject({ capacitance_F: "4.7 nF", voltage_V: "10 kV" });
    expect(created.tier).toBe(1);

    const stranger = await signedInInstructor((await createDepartment()).id);
    const refused = await http("/api/applications", {
      method: "POST",
      cookie: stranger.cookie,
      body: { apparatusId: apparatus.id },
    });
    expect(refused.status).toBe(422);
    expect(refused.json!.error.issues[0].path).toBe("apparatusId");
    void instructor;
  });

  it("refuses a draft to a user without a department, and to an admin without the permission", async () => {
    const loner = await createUser({ roles: ["instructor"], departmentId: null });
    const res = await http("/api/applications", { method: "POST", cookie: await signIn(loner.email), body: {} });
    expect(res.status).toBe(403);
    expect(res.json!.error.message).toMatch(/no department/);
    const admin = await createUser({ roles: ["admin"], departmentId: (await createDepartment()).id });
    expect(
      (await http("/api/applications", { method: "POST", cookie: await signIn(admin.email), body: {} })).status,
    ).toBe(403);
  });
});

describe("POST /api/applications/[id]/duplicate and /withdraw", () => {
  it("duplicates an application into a new draft with the dates empty and nothing confirmed", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const created = await createDraft(cookie);
    const draft = completeDraft(instructor);
    await saveDraft(cookie, created.id, 1, draft);

    const dup = await http(`/api/applications/${created.id}/duplicate`, { method: "POST", cookie, body: {} });
    expect(dup.status, dup.text).toBe(201);
    const copy = (await getDraft(cookie, dup.json!.application.id)).json!.application;
    expect(copy.state).toBe("draft");
    expect(copy.draft.event.firstDay).toBe("");
    expect(copy.draft.event.lastDay).toBe("");
    expect(copy.draft.event.title).toBe(draft.event.title);
    expect(copy.draft.apparatus).toEqual(draft.apparatus);
    expect(copy.draft.controls.required.every((c: { confirmed: boolean }) => !c.confirmed)).toBe(true);
    expect(copy.draft.attestation.accepted).toBe(false);
    const [row] = await getDb().select().from(applications).where(eq(applications.id, dup.json!.application.id));
    expect(row.duplicatedFromId).toBe(created.id);

    const other = await signedInInstructor(instructor.departmentId);
    expect(
      (await http(`/api/applications/${created.id}/duplicate`, { method: "POST", cookie: other.cookie, body: {} }))
        .status,
    ).toBe(404);
  });

  it("withdraws a draft for its applicant only, guarded by the version", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const created = await createDraft(cookie);
    const other = await signedInInstructor(instructor.departmentId);
    const path = `/api/applications/${created.id}/withdraw`;
    expect((await http(path, { method: "POST", cookie: other.cookie, body: { expectedVersion: 1 } })).status).toBe(404);
    expect((await http(path, { method: "POST", cookie, body: { expectedVersion: 7 } })).status).toBe(409);
    const done = await http(path, { method: "POST", cookie, body: { expectedVersion: 1 } });
    expect(done.status, done.text).toBe(200);
    expect(done.json!.application.state).toBe("withdrawn");
    expect((await http(path, { method: "POST", cookie, body: { expectedVersion: 2 } })).status).toBe(409);
    // A withdrawn draft is not edited any more.
    const save = await saveDraft(cookie, created.id, 2, completeDraft(instructor));
    expect(save.status).toBe(409);
    const audit = await getDb()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, created.id), eq(auditEvents.action, "application.withdrawn")));
    expect(audit).toHaveLength(1);
  });
});

describe("GET /api/applications/people", () => {
  it("finds active users by name, without their e-mail addresses", async () => {
    const { cookie } = await instructorWithReviewer();
    const tag = `Quillon${Date.now().toString(36)}`;
    const found = await createUser({ roles: ["instructor"], name: `Wren ${tag}`, departmentId: null });
    const gone = await createUser({ roles: ["instructor"], name: `Ash ${tag}`, departmentId: null });
    const { users } = await import("@/db/schema");
    await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, gone.id));

    const res = await http(`/api/applications/people?q=${tag.toLowerCase()}`, { cookie });
    expect(res.status).toBe(200);
    expect(res.json!.people).toEqual([{ id: found.id, name: found.name, departmentName: null }]);
    expect(res.text).not.toContain("@");
    const short = await http("/api/applications/people?q=a", { cookie });
    expect(short.status).toBe(422);
    expect(short.json!.error.issues[0].path).toBe("q");
  });
});

describe("myDashboardApplications (the instructor's dashboard)", () => {
  it("lists my drafts and my applications waiting on someone, newest first", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const first = await createDraft(cookie);
    await saveDraft(cookie, first.id, 1, completeDraft(instructor, { title: "Older draft" }));
    const second = await createDraft(cookie);
    await saveDraft(cookie, second.id, 1, completeDraft(instructor, { title: "Newer draft" }));
    const sent = await createDraft(cookie);
    const saved = await saveDraft(cookie, sent.id, 1, completeDraft(instructor, { title: "Sent for review" }));
    const submitted = await http(`/api/applications/${sent.id}/submit`, {
      method: "POST",
      cookie,
      body: { expectedVersion: saved.json!.application.version },
    });
    expect(submitted.status, submitted.text).toBe(200);

    const { myDashboardApplications } = await import("@/lib/applications/queries");
    const user = {
      id: instructor.id,
      email: instructor.email,
      name: instructor.name,
      roles: instructor.roles,
      departmentId: instructor.departmentId,
    };
    const dashboard = await myDashboardApplications(user);
    expect(dashboard.drafts.map((d) => d.title)).toEqual(["Newer draft", "Older draft"]);
    expect(dashboard.drafts[0]).toMatchObject({ apparatusName: "Capacitor on the lecture bench", tier: 2 });
    expect(dashboard.open).toEqual([
      expect.objectContaining({ id: sent.id, title: "Sent for review", state: "submitted", tier: 2 }),
    ]);
  });
});
