import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, permits, trainingExceptions } from "@/db/schema";
import { trainingExceptionSealMatches } from "@/lib/records/training-seal";
import { decide } from "@/lib/review/decide";
import { approvalRequirements, audienceFactsOf, DEFAULT_CHAIN_RULES } from "@/lib/rules/chain";
import { completeDraft, pngBytes } from "../applications/support";
import { asActor, createSubmittedApplication, createTeam, currentVersion, isoDayFromNow } from "../review/support";
import { createUser, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { baseUrl, http, randomIp, signIn } from "../support/http";

requireDatabase();

// Training records (issue 17, item 1) over HTTP against the production build: course types, records
// and certificates, and the final approval's training gate with its signed exception. Every course
// type here is required in this file's own department only, so no other test's approvals see it.

type Team = Awaited<ReturnType<typeof createTeam>>;

/** YYYY-MM-DD, `years` years and `days` days from today (UTC calendar). */
function dayFromToday(years: number, days: number): string {
  const now = new Date();
  return new Date(Date.UTC(now.getUTCFullYear() + years, now.getUTCMonth(), now.getUTCDate() + days))
    .toISOString()
    .slice(0, 10);
}

describe("training records", () => {
  let team: Team;
  let admin: Awaited<ReturnType<typeof createUser>>;
  const cookie = { admin: "", officer: "", instructor: "", other: "" };
  let other: Awaited<ReturnType<typeof createUser>>;

  beforeAll(async () => {
    team = await createTeam();
    admin = await createUser({ roles: ["admin"], departmentId: team.office.id });
    other = await createUser({ roles: ["instructor"], departmentId: team.dept.id });
    [cookie.admin, cookie.officer, cookie.instructor, cookie.other] = await Promise.all([
      signIn(admin.email),
      signIn(team.officer.email),
      signIn(team.instructor.email),
      signIn(other.email),
    ]);
  });

  const post = (path: string, who: keyof typeof cookie, body: unknown) =>
    http(path, { method: "POST", cookie: cookie[who], body });

  async function courseType(minTier: number, validityMonths: number) {
    const res = await post("/api/training/course-types", "admin", {
      name: uniq("Course"),
      covers: "Stored energy, grounding hooks, approach distances.",
      validityMonths,
      minTier,
      departmentId: team.dept.id,
    });
    expect(res.status, res.text).toBe(201);
    return res.json!.courseType as { id: string; name: string };
  }

  async function record(userId: string, courseTypeId: string, completedOn: string) {
    const res = await post("/api/training/records", "officer", {
      userId,
      courseTypeId,
      completedOn,
      trainer: "Aldermere safety office",
    });
    expect(res.status, res.text).toBe(201);
    return res.json!.record as { id: string };
  }

  it("lets admins define course types and answers 422 naming the field", async () => {
    const cases: [Record<string, unknown>, string][] = [
      [{ name: "x", validityMonths: 36, minTier: 2 }, "name"],
      [{ name: "High-voltage awareness", validityMonths: 0, minTier: 2 }, "validityMonths"],
      [{ name: "High-voltage awareness", validityMonths: 36, minTier: 5 }, "minTier"],
      [{ name: "High-voltage awareness", validityMonths: 36, minTier: 2, departmentId: "nope" }, "departmentId"],
    ];
    for (const [body, path] of cases) {
      const res = await post("/api/training/course-types", "admin", body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.json?.error.issues.map((i: { path: string }) => i.path)).toContain(path);
    }
    const made = await courseType(2, 36);
    const again = await post("/api/training/course-types", "admin", {
      name: made.name,
      validityMonths: 12,
      minTier: 3,
    });
    expect(again.status).toBe(422);
    expect(again.json?.error.issues[0].path).toBe("name");
    // Officers record training but do not define courses.
    const refused = await post("/api/training/course-types", "officer", {
      name: uniq("C"),
      validityMonths: 12,
      minTier: 3,
    });
    expect(refused.status).toBe(403);
    const retired = await http(`/api/training/course-types/${made.id}`, {
      method: "PATCH",
      cookie: cookie.admin,
      body: { retired: true },
    });
    expect(retired.status).toBe(200);
    expect(retired.json?.courseType.retiredAt).toBeTruthy();
    const listed = await http("/api/training/course-types", { cookie: cookie.instructor });
    expect(listed.json?.courseTypes.map((c: { id: string }) => c.id)).not.toContain(made.id);
    const [audit] = await getDb()
      .select({ action: auditEvents.action })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, made.id), eq(auditEvents.action, "training.course_type_changed")));
    expect(audit).toBeDefined();
  });

  it("computes the lapse day in calendar months, and shows people their own record only", async () => {
    const monthly = await courseType(4, 1);
    const triennial = await courseType(4, 36);
    // Calendar facts (Gregorian calendar; common practice: a qualification "valid for N months"
    // runs to the same day N months on, or that month's last day when it has no such day): one month
    // after 2024-01-31 is 2024-02-29 (2024 is a leap year); 36 months after 2023-03-15 is 2026-03-15.
    await record(team.instructor.id, monthly.id, "2024-01-31");
    await record(team.instructor.id, triennial.id, "2023-03-15");
    const own = await http("/api/training/records", { cookie: cookie.instructor });
    expect(own.status).toBe(200);
    const byCourse = new Map(
      own.json!.records.map((r: { course: string; lapsesOn: string }) => [r.course, r.lapsesOn]),
    );
    expect(byCourse.get(monthly.name)).toBe("2024-02-29");
    expect(byCourse.get(triennial.name)).toBe("2026-03-15");
    // Someone else's record: not for another instructor (404, as if it did not exist), yes for officers.
    const peek = await http(`/api/training/records?userId=${team.instructor.id}`, { cookie: cookie.other });
    expect(peek.status).toBe(404);
    const officerView = await http(`/api/training/records?userId=${team.instructor.id}`, { cookie: cookie.officer });
    expect(officerView.json?.records.length).toBeGreaterThanOrEqual(2);
    // Bad input names the field; a course in the future is refused.
    const future = await post("/api/training/records", "officer", {
      userId: team.instructor.id,
      courseTypeId: monthly.id,
      completedOn: isoDayFromNow(30),
      trainer: "Aldermere safety office",
    });
    expect(future.status).toBe(422);
    expect(future.json?.error.issues[0].path).toBe("completedOn");
    const noTrainer = await post("/api/training/records", "officer", {
      userId: team.instructor.id,
      courseTypeId: monthly.id,
      completedOn: "2024-01-31",
      trainer: "",
    });
    expect(noTrainer.status).toBe(422);
    expect(noTrainer.json?.error.issues[0].path).toBe("trainer");
    const byInstructor = await post("/api/training/records", "instructor", {
      userId: team.instructor.id,
      courseTypeId: monthly.id,
      completedOn: "2024-01-31",
      trainer: "Myself",
    });
    expect(byInstructor.status).toBe(403);
  });

  it("stores a certificate with the uploads' type check and serves it to its person only", async () => {
    const course = await courseType(4, 24);
    const rec = await record(team.instructor.id, course.id, dayFromToday(0, -10));
    const upload = (bytes: Buffer, name: string) => {
      const form = new FormData();
      form.append("file", new Blob([new Uint8Array(bytes)]), name);
      return fetch(`${baseUrl()}/api/training/records/${rec.id}/certificate`, {
        method: "POST",
        headers: { cookie: cookie.officer, origin: baseUrl(), "x-forwarded-for": randomIp() },
        body: form,
      });
    };
    const html = await upload(Buffer.from("<html><script>alert(1)</script></html>"), "certificate.png");
    expect(html.status).toBe(422);
    expect(((await html.json()) as { error: { message: string } }).error.message).toMatch(
      /Only JPEG, PNG, WebP and PDF/,
    );
    const png = pngBytes(12, 12);
    const ok = await upload(png, "certificate.png");
    expect(ok.status).toBe(201);
    const mine = await http(`/api/training/records/${rec.id}/certificate`, { cookie: cookie.instructor });
    expect(mine.status).toBe(200);
    expect(mine.headers.get("content-type")).toBe("image/png");
    const theirs = await http(`/api/training/records/${rec.id}/certificate`, { cookie: cookie.other });
    expect(theirs.status).toBe(404);
  });

  async function approveBody(applicationId: string, content: Parameters<typeof audienceFactsOf>[0]) {
    const ids = approvalRequirements(DEFAULT_CHAIN_RULES, 2, audienceFactsOf(content)).map((r) => r.id);
    return {
      kind: "approve",
      expectedVersion: await currentVersion(applicationId),
      password: TEST_PASSWORD,
      confirmedRequirements: ids,
    };
  }

  async function recommended(operatorId: string, operatorName: string) {
    const fixture = await createSubmittedApplication({
      applicant: team.instructor,
      tier: 2,
      operators: [{ id: operatorId, name: operatorName }],
      namedUserIds: [operatorId],
      firstDay: isoDayFromNow(7),
      lastDay: isoDayFromNow(8),
    });
    await decide(asActor(team.reviewer), fixture.application.id, {
      kind: "recommend",
      expectedVersion: fixture.application.version,
    });
    return fixture;
  }

  it("refuses the approval for an operator whose course lapses before the permit's last day, and allows it after the record is added", async () => {
    const operator = await createUser({ roles: ["instructor"], departmentId: team.dept.id });
    const course = await courseType(2, 24);
    // Completed 24 months and 3 days before the day three days from now: it lapses three days from
    // now, before the event's last day (eight days from now), which is the permit's last day.
    await record(operator.id, course.id, dayFromToday(-2, 3));
    const { application, content } = await recommended(operator.id, operator.name);
    const url = `/api/review/${application.id}/decisions`;

    const refused = await post(url, "officer", await approveBody(application.id, content));
    expect(refused.status).toBe(409);
    expect(refused.json?.error.message).toContain(operator.name);
    expect(refused.json?.error.message).toContain(`${course.name}: lapses on ${dayFromToday(0, 3)}`);
    const [none] = await getDb().select().from(permits).where(eq(permits.applicationId, application.id));
    expect(none).toBeUndefined();

    await record(operator.id, course.id, dayFromToday(0, -1));
    const approved = await post(url, "officer", await approveBody(application.id, content));
    expect(approved.status, approved.text).toBe(201);
    expect(approved.json?.permit.number).toMatch(/^[A-Z0-9]+-\d{4}-\d{4}$/);
  });

  it("shows each named operator's lapsed or missing course on the form's last step, and to the reviewer after submission", async () => {
    const lapsing = await createUser({ roles: ["instructor"], departmentId: team.dept.id, name: "Petra Lindqvist" });
    const current = await createUser({ roles: ["instructor"], departmentId: team.dept.id, name: "Tomas Brightwater" });
    const course = await courseType(2, 24);
    // Lapses three days from now (24 calendar months after completion), before the event's last day.
    await record(lapsing.id, course.id, dayFromToday(-2, 3));
    await record(current.id, course.id, dayFromToday(0, -1));
    const draft = completeDraft(team.instructor);
    draft.event.operators = [
      { userId: lapsing.id, name: lapsing.name, trained: true },
      { userId: current.id, name: current.name, trained: true },
      { userId: null, name: "Opal Fenwick", trained: true },
    ];
    const created = await post("/api/applications", "instructor", { draft });
    expect(created.status, created.text).toBe(201);
    const id = created.json!.application.id as string;

    // The form's last step asks the server; the check runs on the draft as saved.
    const res = await http(`/api/applications/${id}/training`, { cookie: cookie.instructor });
    expect(res.status, res.text).toBe(200);
    const check = res.json!.training as {
      tier: number;
      throughDay: string;
      operators: { operator: string; courses: { courseTypeId: string; status: string; lapsesOn: string | null }[] }[];
    };
    // 4.7 nF at 30 kV stores 2.1 J: tier 2 (tests/applications/support.ts, hazard-model.md's table).
    expect(check.tier).toBe(2);
    // The permit's proposed last day is the event's last day (eight days from now), inside tier 2's 180 days.
    expect(check.throughDay).toBe(completeDraft(team.instructor).event.lastDay);
    const ours = (name: string) =>
      check.operators.find((o) => o.operator === name)!.courses.find((c) => c.courseTypeId === course.id);
    expect(ours(lapsing.name)).toMatchObject({ status: "lapses", lapsesOn: dayFromToday(0, 3) });
    expect(ours(current.name)).toMatchObject({ status: "current", lapsesOn: dayFromToday(2, -1) });
    expect(ours("Opal Fenwick")).toMatchObject({ status: "missing", lapsesOn: null });
    // Only the applicant's own draft.
    expect((await http(`/api/applications/${id}/training`, { cookie: cookie.other })).status).toBe(404);

    // After submission the reviewer sees the same beside each person.
    const submitted = await post(`/api/applications/${id}/submit`, "instructor", {
      expectedVersion: created.json!.application.version,
    });
    expect(submitted.status, submitted.text).toBe(200);
    const reviewerPage = await http(`/applications/${id}`, { cookie: await signIn(team.reviewer.email) });
    expect(reviewerPage.status).toBe(200);
    expect(reviewerPage.text).toContain(`${course.name}: lapses on ${dayFromToday(0, 3)}`);
    expect(reviewerPage.text).toContain(`${course.name}: not recorded`);
  });

  it("allows the approval after the approver records a signed exception with a reason", async () => {
    const operator = await createUser({ roles: ["instructor"], departmentId: team.dept.id });
    const course = await courseType(2, 36);
    const { application, content } = await recommended(operator.id, operator.name);
    const url = `/api/review/${application.id}/decisions`;
    const exceptionUrl = `/api/review/${application.id}/training-exception`;

    const refused = await post(url, "officer", await approveBody(application.id, content));
    expect(refused.status).toBe(409);
    expect(refused.json?.error.message).toContain(`${course.name}: not recorded`);

    const version = await currentVersion(application.id);
    const short = await post(exceptionUrl, "officer", {
      expectedVersion: version,
      reason: "ok",
      password: TEST_PASSWORD,
    });
    expect(short.status).toBe(422);
    expect(short.json?.error.issues[0].path).toBe("reason");
    const reason = "Trained at the previous institution in March; the certificate is on its way by post.";
    const wrongPassword = await post(exceptionUrl, "officer", { expectedVersion: version, reason, password: "nope" });
    expect(wrongPassword.status).toBe(422);
    expect(wrongPassword.json?.error.issues[0].path).toBe("password");
    // Only the final approver: not the reviewer who recommended, not an instructor.
    const byReviewer = await http(exceptionUrl, {
      method: "POST",
      cookie: await signIn(team.reviewer.email),
      body: { expectedVersion: version, reason, password: TEST_PASSWORD },
    });
    expect(byReviewer.status).toBe(403);

    const recorded = await post(exceptionUrl, "officer", { expectedVersion: version, reason, password: TEST_PASSWORD });
    expect(recorded.status, recorded.text).toBe(201);
    expect(recorded.json?.exception.gaps).toContainEqual(
      expect.objectContaining({ userId: operator.id, courseTypeId: course.id, status: "missing", lapsesOn: null }),
    );
    const [row] = await getDb()
      .select()
      .from(trainingExceptions)
      .where(eq(trainingExceptions.applicationId, application.id));
    expect(row.signerId).toBe(team.officer.id);
    expect(trainingExceptionSealMatches(row)).toBe(true);
    expect(trainingExceptionSealMatches({ ...row, reason: "Changed afterwards." })).toBe(false);
    const [audit] = await getDb()
      .select({ id: auditEvents.id })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, application.id), eq(auditEvents.action, "application.training_exception")));
    expect(audit).toBeDefined();

    const again = await post(exceptionUrl, "officer", { expectedVersion: version, reason, password: TEST_PASSWORD });
    expect(again.status).toBe(409);
    const approved = await post(url, "officer", await approveBody(application.id, content));
    expect(approved.status, approved.text).toBe(201);
  });

  it("keeps an officer named on the application from recording its exception", async () => {
    // The officer is the named operator: they may neither approve nor excuse their own training.
    const { application } = await recommended(team.officer.id, team.officer.name);
    const res = await post(`/api/review/${application.id}/training-exception`, "officer", {
      expectedVersion: await currentVersion(application.id),
      reason: "I am trained, the record is just missing.",
      password: TEST_PASSWORD,
    });
    expect(res.status).toBe(403);
    expect(res.json?.error.message).toMatch(/named on this application/);
  });
});
