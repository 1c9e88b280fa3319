import { and, eq, sql } from "drizzle-orm";
import { afterEach, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applications, auditEvents, decisions, institutionSettings, mailOutbox, permits } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { renewPermit } from "@/lib/applications/renew";
import { addDays, daysFromTo, effectivePermitState, inclusiveDays, isIsoDay, todayIn } from "@/lib/permits/dates";
import { formatPermitNumber, newVerificationCode } from "@/lib/permits/numbers";
import { expiringPermits, getPermit, listPermits } from "@/lib/permits/queries";
import { revokePermit } from "@/lib/permits/revoke";
import { decide } from "@/lib/review/decide";
import { DECISION_MEANINGS } from "@/lib/signing/meanings";
import { applicationDraftSchema } from "@/lib/applications/schemas";
import { createUser, redatePermit, requireDatabase, TEST_PASSWORD } from "../support/db";
import { asActor, createSubmittedApplication, createTeam, isoDayFromNow } from "../review/support";

requireDatabase();

async function statusOf(promise: Promise<unknown>): Promise<number | "ok"> {
  try {
    await promise;
    return "ok";
  } catch (error) {
    if (error instanceof AppError) return error.status;
    throw error;
  }
}

/** A tier-1 permit approved by the team's reviewer, held by the team's instructor. */
async function issuedPermit(
  team: Awaited<ReturnType<typeof createTeam>>,
  options: { operators?: { id: string; name: string }[] } = {},
) {
  const { application } = await createSubmittedApplication({
    applicant: team.instructor,
    tier: 1,
    operators: options.operators,
    namedUserIds: options.operators?.map((o) => o.id),
    // A teaching block already under way: the permit starts on the institution's today (issue 20: a
    // permit covers the event days, from today at the earliest).
    firstDay: isoDayFromNow(-1),
    lastDay: isoDayFromNow(60),
  });
  const result = await decide(asActor(team.reviewer), application.id, {
    kind: "approve",
    expectedVersion: application.version,
    password: TEST_PASSWORD,
    confirmedRequirements: [],
    extraConditions: [],
  });
  return { application: result.application, permit: result.permit! };
}

describe("permit days (institution calendar, inclusive windows)", () => {
  it("reads today in the institution's time zone", () => {
    // 2026-03-01 23:30 UTC is already 2 March in Auckland (UTC+13 in March) and still 1 March in New York.
    const instant = new Date("2026-03-01T23:30:00Z");
    expect(todayIn("UTC", instant)).toBe("2026-03-01");
    expect(todayIn("Pacific/Auckland", instant)).toBe("2026-03-02");
    expect(todayIn("America/New_York", instant)).toBe("2026-03-01");
    expect(todayIn("Not/A_Zone", instant)).toBe("2026-03-01");
  });

  it("counts windows inclusively and crosses month and leap-year ends", () => {
    expect(inclusiveDays("2026-03-01", "2026-03-01")).toBe(1);
    expect(inclusiveDays("2026-03-01", "2026-03-30")).toBe(30);
    expect(addDays("2028-02-28", 1)).toBe("2028-02-29");
    expect(addDays("2026-12-31", 1)).toBe("2027-01-01");
    expect(daysFromTo("2026-03-01", "2026-03-08")).toBe(7);
    expect(isIsoDay("2026-02-29")).toBe(false);
    expect(isIsoDay("2028-02-29")).toBe(true);
  });

  it("computes the effective state: revoked, expired once the last day has passed, else active", () => {
    expect(effectivePermitState({ state: "active", validTo: "2026-03-10" }, "2026-03-10")).toBe("active");
    expect(effectivePermitState({ state: "active", validTo: "2026-03-10" }, "2026-03-11")).toBe("expired");
    expect(effectivePermitState({ state: "expired", validTo: "2026-03-10" }, "2026-03-11")).toBe("expired");
    expect(effectivePermitState({ state: "revoked", validTo: "2099-01-01" }, "2026-03-11")).toBe("revoked");
  });

  it("numbers permits PREFIX-YYYY-NNNN and draws 256-bit verification codes", () => {
    // product.md: "a number (PREFIX-YYYY-NNNN, prefix from the institution settings, default HV)".
    expect(formatPermitNumber("HV", 2026, 7)).toBe("HV-2026-0007");
    expect(formatPermitNumber("PHYS2", 2026, 12345)).toBe("PHYS2-2026-12345");
    const codes = new Set(Array.from({ length: 200 }, () => newVerificationCode()));
    expect(codes.size).toBe(200);
    for (const code of codes) expect(Buffer.from(code, "base64url")).toHaveLength(32);
  });
});

describe("the institution's time zone", () => {
  let earlier: (typeof institutionSettings.$inferSelect)[] = [];
  afterEach(async () => {
    // Put back whatever settings row other tests may rely on.
    await getDb().delete(institutionSettings);
    if (earlier.length) await getDb().insert(institutionSettings).values(earlier);
  });

  it("dates a permit by the institution's calendar day", async () => {
    earlier = await getDb().select().from(institutionSettings);
    // Far east of UTC (UTC+14), so the institution's day is usually a day ahead of UTC's.
    await getDb()
      .insert(institutionSettings)
      .values({ name: "Test Institute", timeZone: "Pacific/Kiritimati" })
      .onConflictDoUpdate({ target: institutionSettings.id, set: { timeZone: "Pacific/Kiritimati" } });
    const team = await createTeam();
    const { permit } = await issuedPermit(team);
    expect(permit.validFrom).toBe(todayIn("Pacific/Kiritimati"));
  });
});

describe("revoking a permit", () => {
  it("records a signed revoke decision, audits it and tells the holder and the named operators", async () => {
    const team = await createTeam();
    const operator = await createUser({ roles: ["instructor"], departmentId: team.dept.id });
    const { application, permit } = await issuedPermit(team, { operators: [{ id: operator.id, name: operator.name }] });
    const result = await revokePermit(asActor(team.officer), permit.id, {
      expectedVersion: permit.version,
      password: TEST_PASSWORD,
      reason: "The barrier was removed.",
    });
    expect(result.permit).toMatchObject({
      state: "revoked",
      revokedById: team.officer.id,
      revokedReason: "The barrier was removed.",
    });
    expect(result.decision).toMatchObject({
      kind: "revoke",
      step: null,
      signerRole: "Safety officer",
      meaning: DECISION_MEANINGS.revoke,
      revisionId: permit.revisionId,
      comment: "The barrier was removed.",
    });
    const found = await getPermit(asActor(team.instructor), permit.id);
    expect(found?.effectiveState).toBe("revoked");
    const mail = await getDb()
      .select({ to: mailOutbox.toAddress })
      .from(mailOutbox)
      .where(and(eq(mailOutbox.kind, "permit_revoked"), sql`${mailOutbox.data} ->> 'permitId' = ${permit.id}`));
    expect(mail.map((m) => m.to).sort()).toEqual([team.instructor.email, operator.email].sort());
    const audit = await getDb()
      .select({ action: auditEvents.action })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityType, "permit"), eq(auditEvents.entityId, permit.id)));
    expect(audit.map((a) => a.action)).toEqual(["permit.issued", "permit.revoked"]);
    // The application keeps its state; only the permit ends.
    const [app] = await getDb()
      .select({ state: applications.state })
      .from(applications)
      .where(eq(applications.id, application.id));
    expect(app.state).toBe("approved");
  });

  it("refuses a second revoke (409), a reviewer (403), and an officer named on the permit (403)", async () => {
    const team = await createTeam();
    const { permit } = await issuedPermit(team, { operators: [{ id: team.officer2.id, name: team.officer2.name }] });
    const body = { expectedVersion: permit.version, password: TEST_PASSWORD, reason: "Checks overdue." };
    expect(await statusOf(revokePermit(asActor(team.reviewer), permit.id, body))).toBe(403);
    expect(await statusOf(revokePermit(asActor(team.officer2), permit.id, body))).toBe(403);
    expect(await statusOf(revokePermit(asActor(team.officer), permit.id, body))).toBe("ok");
    expect(
      await statusOf(revokePermit(asActor(team.officer), permit.id, { ...body, expectedVersion: permit.version + 1 })),
    ).toBe(409);
    const revokes = await getDb()
      .select()
      .from(decisions)
      .where(and(eq(decisions.revisionId, permit.revisionId), eq(decisions.kind, "revoke")));
    expect(revokes).toHaveLength(1);
  });

  it("refuses to revoke an expired permit (409)", async () => {
    const team = await createTeam();
    const { permit } = await issuedPermit(team);
    await redatePermit(permit.id, { validFrom: "2020-01-01", validTo: "2020-01-31" });
    expect(
      await statusOf(
        revokePermit(asActor(team.officer), permit.id, {
          expectedVersion: permit.version,
          password: TEST_PASSWORD,
          reason: "Late.",
        }),
      ),
    ).toBe(409);
    expect((await getPermit(asActor(team.officer), permit.id))?.effectiveState).toBe("expired");
  });
});

describe("renewing a permit", () => {
  it("creates a draft prefilled from the permit's revision with the dates cleared, and links it", async () => {
    const team = await createTeam();
    const { application, permit } = await issuedPermit(team);
    const { application: renewal } = await renewPermit(asActor(team.instructor), permit.id);
    const [row] = await getDb().select().from(applications).where(eq(applications.id, renewal.id));
    expect(row).toMatchObject({
      state: "draft",
      applicantId: team.instructor.id,
      departmentId: application.departmentId,
      renewalOfPermitId: permit.id,
      title: application.title,
    });
    const draft = applicationDraftSchema.parse(row.draft);
    expect(draft.event.firstDay).toBe("");
    expect(draft.event.lastDay).toBe("");
    expect(draft.event.title).toBe(application.title);
    expect(draft.event.audienceSize).toBe("40");
    expect(draft.attestation.accepted).toBe(false);
    expect(draft.controls.required.every((c) => !c.confirmed)).toBe(true);
    // The set-up comes back as the form's text: 0.45 µF at 100 V (the tier-1 fixture).
    expect(draft.apparatus.setup.sources).toHaveLength(1);
    expect(draft.apparatus.setup.sources[0].kind).toBe("capacitor");
    expect(draft.apparatus.setup.sources[0].label).toBe("C1");
    const [linked] = await getDb().select().from(permits).where(eq(permits.id, permit.id));
    expect(linked.renewedByApplicationId).toBe(renewal.id);
  });

  it("refuses a second renewal while the first is open (409) but allows one after it is withdrawn", async () => {
    const team = await createTeam();
    const { permit } = await issuedPermit(team);
    const first = await renewPermit(asActor(team.instructor), permit.id);
    expect(await statusOf(renewPermit(asActor(team.instructor), permit.id))).toBe(409);
    await getDb().update(applications).set({ state: "withdrawn" }).where(eq(applications.id, first.application.id));
    expect(await statusOf(renewPermit(asActor(team.instructor), permit.id))).toBe("ok");
  });

  it("lets only the holder renew (404 for anyone else) and never a revoked permit (409)", async () => {
    const team = await createTeam();
    const { permit } = await issuedPermit(team);
    expect(await statusOf(renewPermit(asActor(team.reviewer), permit.id))).toBe(404);
    expect(await statusOf(renewPermit(asActor(team.officer), permit.id))).toBe(404);
    await revokePermit(asActor(team.officer), permit.id, {
      expectedVersion: permit.version,
      password: TEST_PASSWORD,
      reason: "Moved rooms.",
    });
    expect(await statusOf(renewPermit(asActor(team.instructor), permit.id))).toBe(409);
  });
});

describe("who sees which permits", () => {
  it("shows the holder their own, the department's reviewer theirs, the officer all, and hides them from others", async () => {
    const team = await createTeam();
    const { permit } = await issuedPermit(team);
    const stranger = await createUser({ roles: ["instructor"], departmentId: team.office.id });
    const see = async (user: Parameters<typeof asActor>[0]) => (await getPermit(asActor(user), permit.id)) !== null;
    expect(await see(team.instructor)).toBe(true);
    expect(await see(team.reviewer2)).toBe(true);
    expect(await see(team.officer)).toBe(true);
    expect(await see(stranger)).toBe(false);
    expect(await see(team.otherReviewer)).toBe(false);
    const list = await listPermits(asActor(team.instructor), { state: "active" });
    expect(list.rows.map((r) => r.id)).toContain(permit.id);
    expect((await listPermits(asActor(stranger))).rows.map((r) => r.id)).not.toContain(permit.id);
    const revokedOnly = await listPermits(asActor(team.instructor), { state: "revoked" });
    expect(revokedOnly.rows.map((r) => r.id)).not.toContain(permit.id);
  });

  it("pages active permits first, soonest end first, then the rest, with no row lost or repeated at the seam", async () => {
    const team = await createTeam();
    const issued = [];
    for (let i = 0; i < 6; i++) issued.push((await issuedPermit(team)).permit);
    // Three revoked: they sort after every active permit even though their window is still open.
    for (const permit of issued.slice(0, 3)) {
      await revokePermit(asActor(team.officer), permit.id, {
        expectedVersion: permit.version,
        password: TEST_PASSWORD,
        reason: "Ordering check.",
      });
    }
    const stored = await getDb()
      .select({ id: permits.id, state: permits.state, validTo: permits.validTo, issuedAt: permits.issuedAt })
      .from(permits)
      .where(eq(permits.holderId, team.instructor.id));
    // The expected order, written out from the rule the list promises (active first; within each half
    // the earliest last day first, then the newest issue first), sorted here in JavaScript.
    const expected = [...stored]
      .sort(
        (a, b) =>
          Number(a.state === "revoked") - Number(b.state === "revoked") ||
          a.validTo.localeCompare(b.validTo) ||
          b.issuedAt.getTime() - a.issuedAt.getTime(),
      )
      .map((p) => p.id);
    const seen: string[] = [];
    for (let page = 1; page <= 4; page++) {
      const list = await listPermits(asActor(team.instructor), { page, pageSize: 2 });
      expect(list.total).toBe(6);
      seen.push(...list.rows.map((r) => r.id));
    }
    expect(seen).toEqual(expected);
    expect(seen.slice(0, 3).every((id) => stored.find((p) => p.id === id)!.state === "active")).toBe(true);
    // Filtered to one state, the same rows in the same order.
    const revoked = await listPermits(asActor(team.instructor), { state: "revoked" });
    expect(revoked.rows.map((r) => r.id)).toEqual(expected.slice(3));
    expect(revoked.rows.every((r) => r.state === "revoked")).toBe(true);
    // A day after every window has closed, all six are in the second half: expired ones and revoked
    // ones, ordered by last day alone.
    const later = new Date(
      Date.parse(
        `${stored
          .map((p) => p.validTo)
          .sort()
          .at(-1)}T12:00:00Z`,
      ) +
        2 * 86_400_000,
    );
    const afterwards = await listPermits(asActor(team.instructor), {}, later);
    expect(afterwards.rows.map((r) => r.state).sort()).toEqual([
      "expired",
      "expired",
      "expired",
      "revoked",
      "revoked",
      "revoked",
    ]);
    expect((await listPermits(asActor(team.instructor), { state: "active" }, later)).total).toBe(0);
  });

  it("stops counting at the cap, says there are more, and still pages to the last permit", async () => {
    const team = await createTeam();
    const issued = [];
    for (let i = 0; i < 5; i++) issued.push((await issuedPermit(team)).permit);
    await revokePermit(asActor(team.officer), issued[0].id, {
      expectedVersion: issued[0].version,
      password: TEST_PASSWORD,
      reason: "Paging check.",
    });
    const holder = asActor(team.instructor);
    const seen: string[] = [];
    const pages = [];
    for (let page = 1; page <= 3; page++) {
      const list = await listPermits(holder, { page, pageSize: 2, countCap: 3 });
      pages.push({ total: list.total, more: list.more, hasNext: list.hasNext, rows: list.rows.length });
      seen.push(...list.rows.map((r) => r.id));
    }
    // Five permits, the count stopping at three: "more than 3" on every page, and a next page while
    // one is left (2 + 2 + 1 rows, the revoked one last).
    expect(pages).toEqual([
      { total: 3, more: true, hasNext: true, rows: 2 },
      { total: 3, more: true, hasNext: true, rows: 2 },
      { total: 3, more: true, hasNext: false, rows: 1 },
    ]);
    expect(new Set(seen)).toEqual(new Set(issued.map((p) => p.id)));
    expect(seen.at(-1)).toBe(issued[0].id);
    // Under the cap the count is exact.
    const exact = await listPermits(holder, { pageSize: 2, countCap: 5 });
    expect([exact.total, exact.more]).toEqual([5, false]);
  });

  it("lists a permit ending within 30 days among the expiring ones", async () => {
    const team = await createTeam();
    const { permit } = await issuedPermit(team);
    const today = todayIn("UTC");
    await redatePermit(permit.id, { validTo: addDays(today, 5) });
    const soon = await expiringPermits(asActor(team.instructor), 30);
    expect(soon.map((p) => p.id)).toContain(permit.id);
    await redatePermit(permit.id, { validTo: addDays(today, 45) });
    expect((await expiringPermits(asActor(team.instructor), 30)).map((p) => p.id)).not.toContain(permit.id);
  });
});
