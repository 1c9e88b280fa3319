import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { decisions, incidents, permits, users } from "@/db/schema";
import { wallTimeToInstant } from "@/lib/incidents/time";
import { createDepartment, createUser, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { http, institutionSessionCookie, signIn } from "../support/http";
import { pngBytes } from "../applications/support";
import { createSubmittedApplication, createTeam } from "../review/support";
import { auditActions, mailsWithKey, uploadTo } from "./support";

requireDatabase();

// Incident and near-miss reports over HTTP against the production build: reporting, the officers'
// steps, revoking the named permit from a report, who reads a report, photos, and the mail of each
// step (reporter and officers, once per step).

type Team = Awaited<ReturnType<typeof createTeam>>;

const report = (extra: Record<string, unknown> = {}) => ({
  kind: "near_miss",
  summary: "Jar bank found charged after the show",
  description: "The meter read 2 kV across the bank an hour after the demonstration ended.",
  occurredAt: "2026-01-15T10:00",
  location: "B12 lecture theatre",
  injuries: false,
  ...extra,
});

describe("incident and near-miss reports", () => {
  let team: Team;
  let holderPermit: { id: string; version: number };
  const cookie: Record<"instructor" | "reviewer" | "officer" | "officer2", string> = {
    instructor: "",
    reviewer: "",
    officer: "",
    officer2: "",
  };

  beforeAll(async () => {
    team = await createTeam();
    cookie.instructor = await signIn(team.instructor.email);
    cookie.reviewer = await signIn(team.reviewer.email);
    cookie.officer = await signIn(team.officer.email);
    cookie.officer2 = await signIn(team.officer2.email);
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 0 });
    const [permit] = await getDb()
      .select({ id: permits.id, version: permits.version })
      .from(permits)
      .where(eq(permits.applicationId, application.id));
    holderPermit = permit;
  });

  const send = (who: keyof typeof cookie, path: string, method: string, body: unknown) =>
    http(path, { method, cookie: cookie[who], body });

  it("reads a datetime-local value in the institution's zone", () => {
    // memory: British Summer Time is UTC+1 on 1 July, Greenwich Mean Time (UTC+0) on 15 January.
    expect(wallTimeToInstant("2026-07-01T14:30", "Europe/London").toISOString()).toBe("2026-07-01T13:30:00.000Z");
    expect(wallTimeToInstant("2026-01-15T14:30", "Europe/London").toISOString()).toBe("2026-01-15T14:30:00.000Z");
    // memory: Pacific/Auckland is UTC+13 in January (daylight time).
    expect(wallTimeToInstant("2026-01-15T09:00", "Pacific/Auckland").toISOString()).toBe("2026-01-14T20:00:00.000Z");
  });

  it("answers 422 naming the field for a bad report", async () => {
    const stranger = await createUser({ roles: ["instructor"], departmentId: (await createDepartment()).id });
    const { application } = await createSubmittedApplication({ applicant: stranger, tier: 0 });
    const [unseen] = await getDb()
      .select({ id: permits.id })
      .from(permits)
      .where(eq(permits.applicationId, application.id));
    const cases: [Record<string, unknown>, string][] = [
      [report({ summary: "  " }), "summary"],
      [report({ kind: "accident" }), "kind"],
      [report({ occurredAt: "yesterday" }), "occurredAt"],
      [report({ occurredAt: "2999-01-01T10:00" }), "occurredAt"],
      [report({ injuries: "maybe" }), "injuries"],
      [report({ location: "" }), "location"],
      [report({ permitId: "not-an-id" }), "permitId"],
      // A permit the reporter cannot see is refused like one that does not exist.
      [report({ permitId: unseen.id }), "permitId"],
      [report({ extra: 1 }), ""],
    ];
    for (const [body, path] of cases) {
      const res = await send("reviewer", "/api/incidents", "POST", body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      if (path) expect(res.json?.error.issues.map((i: { path: string }) => i.path)).toContain(path);
    }
  });

  it("records a report, its audit event and one e-mail each to the reporter and the officers", async () => {
    const res = await send(
      "reviewer",
      "/api/incidents",
      "POST",
      report({ injuries: true, injuryNote: "A tingle in one hand." }),
    );
    expect(res.status).toBe(201);
    const id = res.json?.incident.id as string;
    expect(await auditActions("incident", id)).toEqual(["incident.reported"]);
    const mails = await mailsWithKey("incident_update", `incident:${id}:reported:`);
    const to = mails.map((m) => m.to);
    expect(to.filter((a) => a === team.reviewer.email)).toHaveLength(1);
    expect(to.filter((a) => a === team.officer.email)).toHaveLength(1);
    expect(to.filter((a) => a === team.officer2.email)).toHaveLength(1);
    expect(mails.find((m) => m.to === team.reviewer.email)?.data.recipient).toBe("reporter");
    expect(mails.find((m) => m.to === team.officer.email)?.data.recipient).toBe("officer");
    // The holder of a permit is not mailed about a report that does not name it.
    expect(to).not.toContain(team.instructor.email);
  });

  it("takes a report from open to investigating to closed, with one e-mail per step and person", async () => {
    const created = await send("reviewer", "/api/incidents", "POST", report());
    const id = created.json?.incident.id as string;
    const url = `/api/incidents/${id}`;
    // Only officers triage.
    expect((await send("reviewer", url, "PATCH", { expectedVersion: 1, state: "investigating" })).status).toBe(403);
    // Closing needs findings and actions, named as fields.
    const early = await send("officer", url, "PATCH", { expectedVersion: 1, state: "closed" });
    expect(early.status).toBe(422);
    expect(early.json?.error.issues.map((i: { path: string }) => i.path).sort()).toEqual(["actions", "findings"]);
    const step1 = await send("officer", url, "PATCH", { expectedVersion: 1, state: "investigating" });
    expect(step1.status).toBe(200);
    expect(step1.json?.step).toBe("investigating");
    // A stale version and a move backwards are refused.
    expect(
      (await send("officer", url, "PATCH", { expectedVersion: 1, state: "closed", findings: "x", actions: "y" }))
        .status,
    ).toBe(409);
    const back = await send("officer", url, "PATCH", { expectedVersion: 2, state: "open" });
    expect(back.status).toBe(422);
    expect(back.json?.error.issues[0].path).toBe("state");
    const step2 = await send("officer2", url, "PATCH", {
      expectedVersion: 2,
      state: "closed",
      findings: "The bleeder's lead had come off its terminal.",
      actions: "Lead re-crimped; bleeder checked before every show.",
    });
    expect(step2.status).toBe(200);
    expect(step2.json?.step).toBe("closed");
    expect(await auditActions("incident", id)).toEqual([
      "incident.reported",
      "incident.investigating",
      "incident.closed",
    ]);
    for (const step of ["reported", "investigating", "closed"]) {
      const mails = await mailsWithKey("incident_update", `incident:${id}:${step}:`);
      for (const person of [team.reviewer, team.officer, team.officer2]) {
        expect(
          mails.filter((m) => m.to === person.email),
          `${step} → ${person.email}`,
        ).toHaveLength(1);
      }
    }
    const closed = await mailsWithKey("incident_update", `incident:${id}:closed:`);
    expect(closed[0].data.findings).toBe("The bleeder's lead had come off its terminal.");
    expect(closed[0].subject).toMatch(/^IR-\d+ closed: Jar bank found charged/);
  });

  it("revokes the permit a report names, from the report, in one step with its e-mails", async () => {
    const created = await send("reviewer", "/api/incidents", "POST", report({ permitId: holderPermit.id }));
    expect(created.status).toBe(201);
    const id = created.json?.incident.id as string;
    const url = `/api/incidents/${id}/revoke-permit`;
    // The permit's revoke rules: the password is checked, and nothing changes when it is wrong.
    const wrong = await send("officer", url, "POST", {
      expectedVersion: holderPermit.version,
      password: "not my password",
      reason: "Bank left charged.",
    });
    expect(wrong.status).toBe(422);
    expect(wrong.json?.error.issues[0].path).toBe("password");
    const stale = await send("officer", url, "POST", {
      expectedVersion: holderPermit.version + 5,
      password: TEST_PASSWORD,
      reason: "Bank left charged.",
    });
    expect(stale.status).toBe(409);
    const [before] = await getDb().select().from(permits).where(eq(permits.id, holderPermit.id));
    expect(before.state).toBe("active");

    const ok = await send("officer", url, "POST", {
      expectedVersion: holderPermit.version,
      password: TEST_PASSWORD,
      reason: "Bank left charged after the show (report).",
    });
    expect(ok.status).toBe(200);
    expect(ok.json?.permit.state).toBe("revoked");
    const [after] = await getDb().select().from(permits).where(eq(permits.id, holderPermit.id));
    expect(after.state).toBe("revoked");
    expect(after.revokedReason).toBe("Bank left charged after the show (report).");
    const revokes = await getDb().select().from(decisions).where(eq(decisions.revisionId, after.revisionId));
    expect(revokes.filter((d) => d.kind === "revoke")).toHaveLength(1);
    const [row] = await getDb().select().from(incidents).where(eq(incidents.id, id));
    expect(row.permitRevokedAt).not.toBeNull();
    expect(await auditActions("incident", id)).toEqual(["incident.reported", "incident.permit_revoked"]);
    expect(await auditActions("permit", holderPermit.id)).toContain("permit.revoked");
    const steps = await mailsWithKey("incident_update", `incident:${id}:permit_revoked:`);
    expect(steps.filter((m) => m.to === team.reviewer.email)).toHaveLength(1);
    expect(steps.filter((m) => m.to === team.officer.email)).toHaveLength(1);
    // A second try finds the permit no longer active.
    const again = await send("officer2", url, "POST", {
      expectedVersion: after.version,
      password: TEST_PASSWORD,
      reason: "Again.",
    });
    expect(again.status).toBe(409);
  });

  it("revokes from a report with a fresh institutional sign-in for an officer without a password, as the permit page does", async () => {
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 0 });
    const [permit] = await getDb()
      .select({ id: permits.id, version: permits.version })
      .from(permits)
      .where(eq(permits.applicationId, application.id));
    const created = await send("reviewer", "/api/incidents", "POST", report({ permitId: permit.id }));
    const id = created.json?.incident.id as string;
    // An officer who signs in only through the institution: no Benchclear password to re-ask.
    const [ssoOfficer] = await getDb()
      .insert(users)
      .values({
        email: `${uniq("sso-officer")}@aldermere.test`,
        name: "Ilse Varga",
        roles: ["safety_officer"],
        oidcIssuer: process.env.OIDC_ISSUER!,
        oidcSubject: uniq("sub"),
      })
      .returning();
    const stale = await institutionSessionCookie(ssoOfficer, Date.now() - 6 * 60_000);
    const fresh = await institutionSessionCookie(ssoOfficer, Date.now());

    // The report's revoke form offers the way this person signs: the institution's button, no password.
    const page = await http(`/incidents/${id}`, { cookie: stale });
    expect(page.status).toBe(200);
    expect(page.text).toContain("Confirm it is you with");
    expect(page.text).not.toMatch(/type="password"/);
    const freshPage = await http(`/incidents/${id}`, { cookie: fresh });
    expect(freshPage.text).toContain("You confirmed who you are through");
    // An officer with a password is asked for it, as before.
    const passwordPage = await http(`/incidents/${id}`, { cookie: cookie.officer });
    expect(passwordPage.text).toMatch(/type="password"/);

    const url = `/api/incidents/${id}/revoke-permit`;
    const body = { expectedVersion: permit.version, reason: "Barrier missing at the show (report)." };
    const refused = await http(url, { method: "POST", cookie: stale, body });
    expect(refused.status, refused.text).toBe(422);
    expect(refused.json?.error.issues).toEqual([
      { path: "password", message: expect.stringContaining("sign in again through your institution") },
    ]);
    const [still] = await getDb().select().from(permits).where(eq(permits.id, permit.id));
    expect(still.state).toBe("active");

    const ok = await http(url, { method: "POST", cookie: fresh, body });
    expect(ok.status, ok.text).toBe(200);
    expect(ok.json?.permit.state).toBe("revoked");
    expect(await auditActions("incident", id)).toEqual(["incident.reported", "incident.permit_revoked"]);
  });

  it("refuses a revocation from a report by an officer who holds the permit (separation of duties)", async () => {
    const { application } = await createSubmittedApplication({ applicant: team.officer, tier: 0 });
    const [own] = await getDb()
      .select({ id: permits.id, version: permits.version })
      .from(permits)
      .where(eq(permits.applicationId, application.id));
    const created = await send("reviewer", "/api/incidents", "POST", report({ permitId: undefined }));
    const id = created.json?.incident.id as string;
    // The report names no permit: nothing to revoke.
    const none = await send("officer", `/api/incidents/${id}/revoke-permit`, "POST", {
      expectedVersion: 1,
      password: TEST_PASSWORD,
      reason: "x",
    });
    expect(none.status).toBe(409);
    const mine = await send("officer", "/api/incidents", "POST", report({ permitId: own.id }));
    const res = await send("officer", `/api/incidents/${mine.json?.incident.id}/revoke-permit`, "POST", {
      expectedVersion: own.version,
      password: TEST_PASSWORD,
      reason: "My own.",
    });
    expect(res.status).toBe(403);
  });

  it("shows a report to the holder of the permit it names without the reporter's name, and to no one else", async () => {
    const created = await send("officer2", "/api/incidents", "POST", report({ permitId: holderPermit.id }));
    const id = created.json?.incident.id as string;
    const asHolder = await send("instructor", `/api/incidents/${id}`, "GET", undefined);
    expect(asHolder.status).toBe(200);
    expect(asHolder.json?.reporterName).toBeNull();
    expect(asHolder.json?.incident.reporterId).toBeNull();
    expect(JSON.stringify(asHolder.json)).not.toContain(team.officer2.name);
    expect(asHolder.json?.mayTriage).toBe(false);
    const asReporter = await send("officer2", `/api/incidents/${id}`, "GET", undefined);
    expect(asReporter.json?.reporterName).toBe(team.officer2.name);
    // A reviewer of the holder's department is not told of it.
    expect((await send("reviewer", `/api/incidents/${id}`, "GET", undefined)).status).toBe(404);
    const list = await send("instructor", `/api/incidents?permitId=${holderPermit.id}`, "GET", undefined);
    expect(list.json?.rows.map((r: { id: string }) => r.id)).toContain(id);
    const theirs = await send("reviewer", `/api/incidents?permitId=${holderPermit.id}`, "GET", undefined);
    expect(theirs.json?.rows.map((r: { id: string }) => r.id)).not.toContain(id);
    // The permit page lists it for the holder.
    const page = await http(`/permits/${holderPermit.id}`, { cookie: cookie.instructor });
    expect(page.status).toBe(200);
    expect(page.text).toContain("Incidents and near misses");
    expect(page.text).toContain(`/incidents/${id}`);
  });

  it("stores a photo by the attachment rules and serves it to readers of the report", async () => {
    const created = await send("reviewer", "/api/incidents", "POST", report({ permitId: holderPermit.id }));
    const id = created.json?.incident.id as string;
    const png = pngBytes(12, 12);
    const ok = await uploadTo(cookie.reviewer, `/api/incidents/${id}/photos`, png, "bench.png", "image/png");
    expect(ok.status).toBe(201);
    expect(ok.json?.photo.contentType).toBe("image/png");
    // An HTML page named .png is refused by its content.
    const html = Buffer.from("<!doctype html><script>alert(1)</script>");
    const bad = await uploadTo(cookie.reviewer, `/api/incidents/${id}/photos`, html, "x.png", "image/png");
    expect(bad.status).toBe(422);
    expect(bad.json?.error.issues[0].path).toBe("file");
    // The holder reads it but does not add photos.
    const holderAdds = await uploadTo(cookie.instructor, `/api/incidents/${id}/photos`, png, "b.png", "image/png");
    expect(holderAdds.status).toBe(403);
    const got = await fetch(`${process.env.TEST_BASE_URL}/api/incidents/${id}/photos/${ok.json?.photo.id}`, {
      headers: { cookie: cookie.instructor },
    });
    expect(got.status).toBe(200);
    expect(got.headers.get("content-type")).toBe("image/png");
    expect(Buffer.from(await got.arrayBuffer()).equals(png)).toBe(true);
    expect(await auditActions("incident", id)).toEqual(["incident.reported", "incident.photo_added"]);
  });
});
