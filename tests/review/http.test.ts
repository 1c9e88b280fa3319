import { beforeAll, describe, expect, it } from "vitest";
import { DEFAULT_CHAIN_RULES } from "@/lib/rules/chain";
import { requireDatabase, TEST_PASSWORD } from "../support/db";
import { http, signIn } from "../support/http";
import { createSubmittedApplication, createTeam, resubmit } from "./support";

requireDatabase();

// The review and permit endpoints and pages over HTTP, against the production build.

type Team = Awaited<ReturnType<typeof createTeam>>;
const tier3 = DEFAULT_CHAIN_RULES.tiers[3].requirements.map((r) => r.id);

describe("review and permits over HTTP", () => {
  let team: Team;
  const cookie: Record<"instructor" | "reviewer" | "officer", string> = { instructor: "", reviewer: "", officer: "" };

  beforeAll(async () => {
    team = await createTeam();
    cookie.instructor = await signIn(team.instructor.email);
    cookie.reviewer = await signIn(team.reviewer.email);
    cookie.officer = await signIn(team.officer.email);
  });

  const post = (path: string, who: keyof typeof cookie, body: unknown) =>
    http(path, { method: "POST", cookie: cookie[who], body });

  it("answers 422 naming the field for a bad decision body, and 415 / 403 for a bad request", async () => {
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 1 });
    const url = `/api/review/${application.id}/decisions`;
    const v = application.version;
    const cases: [unknown, string][] = [
      [{ kind: "approve", expectedVersion: v }, "password"],
      [{ kind: "return", expectedVersion: v }, "comment"],
      [{ kind: "return", expectedVersion: v, comment: "   " }, "comment"],
      [{ kind: "reject", expectedVersion: v, password: TEST_PASSWORD }, "comment"],
      [{ kind: "sign-everything", expectedVersion: v }, "kind"],
      [{ kind: "recommend" }, "expectedVersion"],
      [{ kind: "return", expectedVersion: v, comment: "x", pinnedTo: "DROP TABLE" }, "pinnedTo"],
      [{ kind: "approve", expectedVersion: v, password: "x", validTo: "31/12/2026" }, "validTo"],
    ];
    for (const [body, path] of cases) {
      const res = await post(url, "reviewer", body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.json?.error.issues.map((i: { path: string }) => i.path)).toContain(path);
    }
    const wrong = await post(url, "reviewer", { kind: "approve", expectedVersion: v, password: "not my password" });
    expect(wrong.status).toBe(422);
    expect(wrong.json?.error.issues).toEqual([{ path: "password", message: "The password is not correct." }]);
    // Not an id at all: the same 404 as an application that does not exist (route()'s ids).
    const notAnId = await post("/api/review/not-a-uuid/decisions", "reviewer", {
      kind: "recommend",
      expectedVersion: 1,
    });
    expect(notAnId.status).toBe(404);
    expect(notAnId.json?.error.code).toBe("not_found");
    const form = await http(url, {
      method: "POST",
      cookie: cookie.reviewer,
      rawBody: "kind=recommend",
      headers: { "content-type": "application/x-www-form-urlencoded" },
    });
    expect(form.status).toBe(415);
    const crossSite = await http(url, {
      method: "POST",
      cookie: cookie.reviewer,
      body: { kind: "recommend", expectedVersion: v },
      noOrigin: true,
    });
    expect(crossSite.status).toBe(403);
  });

  it("runs return, resubmission, recommendation and approval, and shows the permit as active", async () => {
    const { application } = await createSubmittedApplication({
      applicant: team.instructor,
      tier: 3,
      title: "=2+5 sphere gap night",
    });
    const ret = await post(`/api/review/${application.id}/decisions`, "reviewer", {
      kind: "return",
      expectedVersion: application.version,
      comment: "Name the second trained person.",
      pinnedTo: "event.operators",
    });
    expect(ret.status).toBe(201);
    expect(ret.json?.application.state).toBe("returned");

    const second = await resubmit(application, team.instructor, (c) => ({
      ...c,
      event: { ...c.event, operators: [{ userId: null, name: "Sam Okafor", trained: true }] },
    }));
    const page = await http(`/applications/${application.id}`, { cookie: cookie.reviewer });
    expect(page.status).toBe(200);
    expect(page.text).toContain("Changes since revision 1");
    expect(page.text).toContain("Sam Okafor (trained)");
    expect(page.text).toContain("Name the second trained person.");

    const rec = await post(`/api/review/${application.id}/decisions`, "reviewer", {
      kind: "recommend",
      expectedVersion: second.application.version,
    });
    expect(rec.status).toBe(201);
    // The same reviewer trying the officer's step is refused; so is a stale version.
    expect(
      (
        await post(`/api/review/${application.id}/decisions`, "reviewer", {
          kind: "approve",
          expectedVersion: rec.json?.application.version,
          password: TEST_PASSWORD,
        })
      ).status,
    ).toBe(403);
    const stale = await post(`/api/review/${application.id}/decisions`, "officer", {
      kind: "approve",
      expectedVersion: second.application.version,
      password: TEST_PASSWORD,
      confirmedRequirements: tier3,
    });
    expect(stale.status).toBe(409);
    const approved = await post(`/api/review/${application.id}/decisions`, "officer", {
      kind: "approve",
      expectedVersion: rec.json?.application.version,
      password: TEST_PASSWORD,
      confirmedRequirements: tier3,
      extraConditions: ["Lights on in the hall."],
    });
    expect(approved.status).toBe(201);
    expect(approved.json?.decision).toMatchObject({
      kind: "approve",
      signerName: team.officer.name,
      signerRole: "Safety officer",
      contentHash: second.contentHash,
    });
    const permitId = approved.json?.permit.id as string;
    // product.md: PREFIX-YYYY-NNNN; the prefix is admin-editable (1–6 upper-case letters and digits).
    expect(approved.json?.permit.number).toMatch(/^[A-Z][A-Z0-9]{0,5}-\d{4}-\d{4}$/);

    const permit = await http(`/api/permits/${permitId}`, { cookie: cookie.instructor });
    expect(permit.status).toBe(200);
    expect(permit.json?.permit).toMatchObject({
      state: "active",
      conditions: expect.arrayContaining(["Lights on in the hall."]),
    });
    expect(permit.json?.permit.verificationCode).toMatch(/^[A-Za-z0-9_-]{43}$/);
    const detail = await http(`/permits/${permitId}`, { cookie: cookie.instructor });
    expect(detail.status).toBe(200);
    expect(detail.text).toContain(approved.json?.permit.number);
    expect(detail.text).toContain("De-energise and ground a set-up before anyone touches it.");
    expect(detail.text).toContain("Renew this permit");

    // The officers' permit export neutralises the formula-looking title.
    const csv = await http("/api/permits/export.csv", { cookie: cookie.officer });
    expect(csv.status).toBe(200);
    expect(csv.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(csv.headers.get("content-disposition")).toMatch(/^attachment; filename="benchclear-permits-/);
    const line = csv.text.split("\r\n").find((l) => l.startsWith(approved.json?.permit.number));
    expect(line).toContain(",'=2+5 sphere gap night,");

    // Revoking over HTTP: the reason and the password are required.
    const noReason = await post(`/api/permits/${permitId}/revoke`, "officer", {
      expectedVersion: 1,
      password: TEST_PASSWORD,
      reason: "",
    });
    expect(noReason.json?.error.issues.map((i: { path: string }) => i.path)).toEqual(["reason"]);
    const badPassword = await post(`/api/permits/${permitId}/revoke`, "officer", {
      expectedVersion: 1,
      password: "nope",
      reason: "Test.",
    });
    expect(badPassword.json?.error.issues).toEqual([{ path: "password", message: "The password is not correct." }]);
    const revoked = await post(`/api/permits/${permitId}/revoke`, "officer", {
      expectedVersion: 1,
      password: TEST_PASSWORD,
      reason: "Hall booked for exams.",
    });
    expect(revoked.status).toBe(200);
    expect((await http(`/api/permits/${permitId}`, { cookie: cookie.instructor })).json?.permit.state).toBe("revoked");
  });

  it("exports the audit trail for a date range and refuses a reversed or malformed range", async () => {
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 2 });
    const today = new Date().toISOString().slice(0, 10);
    const csv = await http(`/api/audit/export.csv?from=${today}&to=${today}`, { cookie: cookie.officer });
    expect(csv.status).toBe(200);
    const [header, ...rows] = csv.text.trim().split("\r\n");
    expect(header).toBe("id,occurred_at_utc,actor_id,actor_name,action,entity_type,entity_id,data");
    expect(rows.some((r) => r.includes(`,application.submitted,application,${application.id},`))).toBe(true);
    const past = await http("/api/audit/export.csv?from=2001-01-01&to=2001-01-31", { cookie: cookie.officer });
    expect(past.text.trim().split("\r\n")).toHaveLength(1);
    const reversed = await http(`/api/audit/export.csv?from=2026-02-01&to=2026-01-01`, { cookie: cookie.officer });
    expect(reversed.status).toBe(422);
    expect(reversed.json?.error.issues[0].path).toBe("to");
    const malformed = await http(`/api/audit/export.csv?from=yesterday`, { cookie: cookie.officer });
    expect(malformed.status).toBe(422);
    expect(malformed.json?.error.issues[0].path).toBe("from");
  });

  it("lists the queue as JSON and renders it with the application's row", async () => {
    const { application } = await createSubmittedApplication({
      applicant: team.instructor,
      tier: 2,
      title: "Queue row check",
    });
    const json = await http("/api/review", { cookie: cookie.reviewer });
    expect(json.status).toBe(200);
    expect(json.json?.applications.map((a: { id: string }) => a.id)).toContain(application.id);
    expect((await http("/api/review?tier=9", { cookie: cookie.reviewer })).json?.error.issues[0].path).toBe("tier");
    const page = await http("/review?tier=2", { cookie: cookie.reviewer });
    expect(page.status).toBe(200);
    expect(page.text).toContain("Queue row check");
  });

  it("refuses an invalid rule set with the field's path", async () => {
    const admin = await (await import("../support/db")).createUser({ roles: ["admin"] });
    const adminCookie = await signIn(admin.email);
    const rules = structuredClone(DEFAULT_CHAIN_RULES);
    rules.tiers[3].steps = [];
    const res = await http("/api/admin/rules", { method: "POST", cookie: adminCookie, body: { kind: "chain", rules } });
    expect(res.status).toBe(422);
    expect(res.json?.error.issues.map((i: { path: string }) => i.path)).toContain("rules.tiers[3].steps");
    const current = await http("/api/admin/rules", { cookie: adminCookie });
    expect(current.json?.chain.rules.tiers[3].steps).toEqual(["reviewer", "safety_officer"]);
    expect(current.json?.reminders.rules.daysBefore).toEqual([30, 7, 1, 0]);
  });
});
