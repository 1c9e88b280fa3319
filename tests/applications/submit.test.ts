import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applicationRevisions, applications, auditEvents, mailOutbox } from "@/db/schema";
import { ATTESTATION_TEXT } from "@/lib/applications/draft";
import { assessSetup, requiredControls } from "@/lib/hazard";
import { revisionHash } from "@/lib/signing/canonical";
import { applicationContentSchema } from "@/lib/applications/schemas";
import { createUser, requireDatabase } from "../support/db";
import { http } from "../support/http";
import {
  completeDraft,
  createDraft,
  getDraft,
  instructorWithReviewer,
  isoDayFromNow,
  saveDraft,
  savedDraft,
  setupOf,
  submit,
  TIER1_SETUP_TEXT,
  TIER2_SETUP_TEXT,
} from "./support";

requireDatabase();

const issuePaths = (res: { json?: Record<string, any> }) =>
  (res.json?.error?.issues ?? []).map((i: { path: string }) => i.path);

describe("POST /api/applications/[id]/submit", () => {
  it("refuses an empty draft with 422 naming every missing field, and keeps the draft", async () => {
    const { cookie } = await instructorWithReviewer();
    const created = await createDraft(cookie);
    const res = await submit(cookie, created.id, 1);
    expect(res.status).toBe(422);
    expect(issuePaths(res)).toEqual(
      expect.arrayContaining([
        "event.title",
        "event.kind",
        "event.room",
        "event.audience",
        "event.firstDay",
        "event.lastDay",
        "apparatus.name",
        "apparatus.setup.sources",
        "attestation.accepted",
      ]),
    );
    const after = await getDraft(cookie, created.id);
    expect(after.json!.application).toMatchObject({ state: "draft", version: 1 });
  });

  it("names the field of an out-of-range or unreadable value: a last day before the first, a bad unit", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const draft = completeDraft(instructor);
    draft.event.firstDay = isoDayFromNow(10);
    draft.event.lastDay = isoDayFromNow(9);
    draft.apparatus.setup.sources[0].capacitance_F = "4.7 nQ";
    const { id, version } = await savedDraft(cookie, draft);
    const res = await submit(cookie, id, version);
    expect(res.status).toBe(422);
    expect(issuePaths(res)).toEqual(["event.lastDay", "apparatus.setup.sources[0].capacitance_F"]);
    expect(res.json!.error.message).toBe("event.lastDay: The last day is before the first day.");
    expect(res.json!.error.issues[1].message).toMatch(/Unknown unit "nQ"/);
  });

  it("asks for every control the tier requires, and for a trained operator from tier 2", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const draft = completeDraft(instructor);
    draft.controls.required[1].confirmed = false;
    draft.event.operators = [];
    const { id, version } = await savedDraft(cookie, draft);
    const res = await submit(cookie, id, version);
    expect(res.status).toBe(422);
    expect(issuePaths(res)).toEqual(["controls.required[1].confirmed", "event.operators"]);
  });

  it("freezes the draft into revision 1: content per the contract, assessment recomputed, hash recomputable", async () => {
    const { instructor, reviewer, cookie } = await instructorWithReviewer();
    // A second reviewer of the department who is named on the application: no mail for them.
    const namedReviewer = await createUser({ roles: ["reviewer"], departmentId: instructor.departmentId });
    const draft = completeDraft(instructor);
    draft.event.operators.push({ userId: namedReviewer.id, name: "A name typed by hand", trained: true });
    const { id, version } = await savedDraft(cookie, draft);

    const res = await submit(cookie, id, version);
    expect(res.status, res.text).toBe(200);
    const result = res.json!.application;
    expect(result).toMatchObject({ state: "submitted", revision: 1, tier: 2 });

    const [revision] = await getDb()
      .select()
      .from(applicationRevisions)
      .where(eq(applicationRevisions.applicationId, id));
    expect(revision.revision).toBe(1);
    const content = applicationContentSchema.parse(revision.content);
    expect(content).toEqual(revision.content);
    // The assessment is the engine's for the frozen set-up, not anything the browser sent.
    expect(revision.assessment).toEqual(assessSetup(content.apparatus.setup));
    expect(content.apparatus.setup.sources[0]).toMatchObject({ capacitance_F: 4.7e-9, voltage_V: 30_000 });
    expect(revision.contentHash).toBe(revisionHash(revision.content, revision.assessment));
    expect(result.contentHash).toBe(revision.contentHash);
    expect(revision.tier).toBe(2);
    // The controls are the rules' own list for the tier, in order, with the applicant's notes.
    expect(content.controls.required.map((c) => c.code)).toEqual(requiredControls(2).map((c) => c.id));
    expect(content.attestation).toEqual({ accepted: true, text: ATTESTATION_TEXT });
    // A user named by id is shown with the name on record.
    expect(content.event.operators[1]).toEqual({ userId: namedReviewer.id, name: namedReviewer.name, trained: true });

    const [row] = await getDb().select().from(applications).where(eq(applications.id, id));
    expect(row).toMatchObject({
      state: "submitted",
      currentRevisionId: revision.id,
      tier: 2,
      chainStep: 0,
      departmentId: instructor.departmentId,
    });
    expect(row.version).toBe(version + 1);
    expect(row.submittedAt).not.toBeNull();
    expect(row.waitingSince).not.toBeNull();
    expect(row.chainRulesVersion).not.toBeNull();
    expect(new Set(row.namedUserIds)).toEqual(new Set([instructor.id, namedReviewer.id]));

    const audit = await getDb()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, id), eq(auditEvents.action, "application.submitted")));
    expect(audit).toHaveLength(1);
    expect(audit[0].data).toMatchObject({ revisionId: revision.id, contentHash: revision.contentHash });

    const mail = await getDb().select().from(mailOutbox).where(eq(mailOutbox.kind, "application_submitted"));
    const mine = mail.filter((m) => m.data.applicationId === id);
    expect(mine.map((m) => m.toAddress)).toEqual([reviewer.email]);
    expect(mine[0].data).toMatchObject({ title: draft.event.title, applicantName: instructor.name, tier: 2 });

    // Submitted: no second submission, no more editing.
    expect((await submit(cookie, id, row.version)).status).toBe(409);
    expect((await saveDraft(cookie, id, row.version, draft)).status).toBe(409);
  });

  it("answers 409 to a stale version and 404 to someone else's application", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const { id, version } = await savedDraft(cookie, completeDraft(instructor));
    expect((await submit(cookie, id, version - 1)).status).toBe(409);
    const other = await createUser({ roles: ["instructor"], departmentId: instructor.departmentId });
    const { signIn } = await import("../support/http");
    expect((await submit(await signIn(other.email), id, version)).status).toBe(404);
  });

  it("a returned application is edited into revision 2", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const { id, version } = await savedDraft(cookie, completeDraft(instructor, { setupText: TIER1_SETUP_TEXT }));
    const first = await submit(cookie, id, version);
    expect(first.status, first.text).toBe(200);
    expect(first.json!.application.tier).toBe(1);
    // What a reviewer's return does to the row (lib/review owns the decision itself).
    const [returned] = await getDb()
      .update(applications)
      .set({ state: "returned", version: first.json!.application.version + 1 })
      .where(eq(applications.id, id))
      .returning();

    const editing = await getDraft(cookie, id);
    expect(editing.json!.application).toMatchObject({ state: "returned", editable: true, revisions: 1 });
    const draft = editing.json!.application.draft;
    expect(draft.attestation.accepted).toBe(false);
    draft.apparatus.setup = TIER2_SETUP_TEXT;
    draft.controls.required = requiredControls(2).map((c) => ({ code: c.id, confirmed: true, note: "" }));
    draft.attestation.accepted = true;
    const saved = await saveDraft(cookie, id, returned.version, draft, 6);
    expect(saved.status, saved.text).toBe(200);
    const second = await submit(cookie, id, saved.json!.application.version);
    expect(second.status, second.text).toBe(200);
    expect(second.json!.application).toMatchObject({ revision: 2, tier: 2, state: "submitted" });
    const revisions = await getDb()
      .select()
      .from(applicationRevisions)
      .where(eq(applicationRevisions.applicationId, id));
    expect(revisions.map((r) => r.revision).sort()).toEqual([1, 2]);
    const [row] = await getDb().select().from(applications).where(eq(applications.id, id));
    expect(row.currentRevisionId).toBe(revisions.find((r) => r.revision === 2)!.id);
    expect(row.tier).toBe(assessSetup(setupOf(TIER2_SETUP_TEXT)).tier);
  });

  it("records the registry revision used, and refuses when the set-up no longer matches it", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const made = await http("/api/apparatus", {
      method: "POST",
      cookie,
      body: { name: "Jar battery", room: "B12", notes: "", setup: setupOf(TIER2_SETUP_TEXT) },
    });
    const apparatus = made.json!.apparatus;
    const created = await createDraft(cookie, { apparatusId: apparatus.id });
    const loaded = (await getDraft(cookie, created.id)).json!.application.draft;
    const draft = completeDraft(instructor);
    draft.apparatus = loaded.apparatus;

    const changed = structuredClone(draft);
    changed.apparatus.setup.sources[0].voltage_V = "31 kV";
    const bad = await saveDraft(cookie, created.id, 1, changed, 6);
    const refused = await submit(cookie, created.id, bad.json!.application.version);
    expect(refused.status).toBe(422);
    expect(issuePaths(refused)).toEqual(["apparatus.apparatusRevisionId"]);

    const good = await saveDraft(cookie, created.id, bad.json!.application.version, draft, 6);
    const ok = await submit(cookie, created.id, good.json!.application.version);
    expect(ok.status, ok.text).toBe(200);
    const [row] = await getDb().select().from(applications).where(eq(applications.id, created.id));
    expect(row.apparatusId).toBe(apparatus.id);
    expect(row.apparatusRevisionId).toBe(apparatus.revisionId);
  });
});

describe("GET /api/applications", () => {
  it("lists only my applications, paged and sorted on the server, filtered by state", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const titles = ["Alpha demo", "Bravo demo", "Charlie demo", "Delta demo", "Echo demo", "Foxtrot demo", "Golf demo"];
    const ids: string[] = [];
    for (const title of titles) {
      const created = await createDraft(cookie);
      await saveDraft(cookie, created.id, 1, completeDraft(instructor, { title }));
      ids.push(created.id);
    }
    await http(`/api/applications/${ids[0]}/withdraw`, { method: "POST", cookie, body: { expectedVersion: 2 } });

    const page1 = await http("/api/applications?sort=title&dir=asc&pageSize=5", { cookie });
    expect(page1.status).toBe(200);
    expect(page1.json!.total).toBe(7);
    expect(page1.json!.rows.map((r: { title: string }) => r.title)).toEqual(titles.slice(0, 5));
    const page2 = await http("/api/applications?sort=title&dir=asc&pageSize=5&page=2", { cookie });
    expect(page2.json!.rows.map((r: { title: string }) => r.title)).toEqual(titles.slice(5));
    const desc = await http("/api/applications?sort=title&dir=desc&pageSize=5", { cookie });
    expect(desc.json!.rows[0].title).toBe("Golf demo");

    const withdrawn = await http("/api/applications?state=withdrawn", { cookie });
    expect(withdrawn.json!.rows.map((r: { id: string }) => r.id)).toEqual([ids[0]]);
    const drafts = await http("/api/applications?state=draft", { cookie });
    expect(drafts.json!.total).toBe(6);

    const bad = await http("/api/applications?sort=colour", { cookie });
    expect(bad.status).toBe(422);
    expect(bad.json!.error.issues[0].path).toBe("sort");

    const someoneElse = await instructorWithReviewer();
    const theirs = await http("/api/applications", { cookie: someoneElse.cookie });
    expect(theirs.json!.total).toBe(0);
  });
});
