import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applications } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { decide } from "@/lib/review/decide";
import { cappedCount, cappedSum } from "@/lib/review/counts";
import { listQueue, QUEUE_COUNT_CAP, QUEUE_PAGE_SIZE, queueCountsByTier } from "@/lib/review/queries";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import { asActor, createSubmittedApplication, createTeam } from "./support";

requireDatabase();

const DAY_MS = 86_400_000;
const daysAgo = (n: number) => new Date(Date.now() - n * DAY_MS);

describe("the review queue", () => {
  it("shows a reviewer their department's applications at the reviewer step, and the officer those at theirs", async () => {
    const team = await createTeam();
    const other = await createTeam();
    const mine = await createSubmittedApplication({ applicant: team.instructor, tier: 3 });
    const theirs = await createSubmittedApplication({ applicant: other.instructor, tier: 3 });
    const own = await createSubmittedApplication({ applicant: team.reviewer, tier: 2 });

    // Officers see every department: keep their view to this test's one.
    const ids = async (user: Parameters<typeof asActor>[0], scope: "mine" | "all" = "mine") =>
      (
        await listQueue(asActor(user), {
          scope,
          departmentId: user.roles.includes("safety_officer") ? team.dept.id : undefined,
        })
      ).rows.map((r) => r.id);
    const reviewerSees = await ids(team.reviewer);
    expect(reviewerSees).toContain(mine.application.id);
    expect(reviewerSees).not.toContain(theirs.application.id);
    // Their own application waits for the other reviewer, not for them.
    expect(reviewerSees).not.toContain(own.application.id);
    expect(await ids(team.reviewer2)).toContain(own.application.id);
    // At the reviewer step nothing waits for the safety officer, though "anyone" shows it to them.
    expect(await ids(team.officer)).not.toContain(mine.application.id);
    expect(await ids(team.officer, "all")).toContain(mine.application.id);

    const rec = await decide(asActor(team.reviewer), mine.application.id, {
      kind: "recommend",
      expectedVersion: mine.application.version,
    });
    expect(await ids(team.reviewer)).not.toContain(mine.application.id);
    expect(await ids(team.reviewer2)).not.toContain(mine.application.id);
    expect(await ids(team.officer)).toContain(rec.application.id);
    const row = (await listQueue(asActor(team.officer), { departmentId: team.dept.id })).rows.find(
      (r) => r.id === mine.application.id,
    );
    expect(row).toMatchObject({
      state: "in_review",
      pendingRole: "safety_officer",
      actionable: true,
      chainStep: 1,
      tier: 3,
    });
  });

  it("sorts by waiting time, oldest first, and filters by tier, state, age and department", async () => {
    const team = await createTeam();
    const officer = asActor(team.officer);
    const five = await createSubmittedApplication({ applicant: team.instructor, tier: 2, waitingSince: daysAgo(5) });
    const two = await createSubmittedApplication({ applicant: team.instructor, tier: 3, waitingSince: daysAgo(2) });
    const ten = await createSubmittedApplication({ applicant: team.instructor, tier: 4, waitingSince: daysAgo(10) });
    const all = await listQueue(officer, { scope: "all", departmentId: team.dept.id });
    expect(all.rows.map((r) => r.id)).toEqual([ten.application.id, five.application.id, two.application.id]);
    expect(all.total).toBe(3);

    const older = await listQueue(officer, { scope: "all", departmentId: team.dept.id, minAgeDays: 3 });
    expect(older.rows.map((r) => r.id)).toEqual([ten.application.id, five.application.id]);
    const tier3 = await listQueue(officer, { scope: "all", departmentId: team.dept.id, tier: 3 });
    expect(tier3.rows.map((r) => r.id)).toEqual([two.application.id]);

    await decide(asActor(team.reviewer), five.application.id, {
      kind: "recommend",
      expectedVersion: five.application.version,
    });
    const inReview = await listQueue(officer, { scope: "all", departmentId: team.dept.id, state: "in_review" });
    expect(inReview.rows.map((r) => r.id)).toEqual([five.application.id]);
    // The recommendation restarted its wait: it now waits least.
    const resorted = await listQueue(officer, { scope: "all", departmentId: team.dept.id });
    expect(resorted.rows.map((r) => r.id)).toEqual([ten.application.id, two.application.id, five.application.id]);
  });

  it("pages on the server", { timeout: 60_000 }, async () => {
    const team = await createTeam();
    const n = QUEUE_PAGE_SIZE + 2;
    for (let i = 0; i < n; i++)
      await createSubmittedApplication({ applicant: team.instructor, tier: 1, waitingSince: daysAgo(n - i) });
    const first = await listQueue(asActor(team.reviewer), { page: 1 });
    const second = await listQueue(asActor(team.reviewer), { page: 2 });
    expect(first.total).toBe(n);
    expect(first.rows).toHaveLength(QUEUE_PAGE_SIZE);
    expect(second.rows).toHaveLength(2);
    const seen = new Set([...first.rows, ...second.rows].map((r) => r.id));
    expect(seen.size).toBe(n);
  });

  it(
    'stops counting past the cap, reads it as "100+", and still pages to the last one',
    { timeout: 120_000 },
    async () => {
      const team = await createTeam();
      const n = QUEUE_COUNT_CAP + 2;
      const ids: string[] = [];
      for (let i = 0; i < n; i++) {
        const { application } = await createSubmittedApplication({
          applicant: team.instructor,
          tier: 1,
          waitingSince: daysAgo(n - i),
        });
        ids.push(application.id);
      }
      await createSubmittedApplication({ applicant: team.instructor, tier: 2 });
      const reviewer = asActor(team.reviewer);

      const counts = await queueCountsByTier(reviewer);
      expect(counts[1]).toBe(QUEUE_COUNT_CAP + 1);
      expect(counts[2]).toBe(1);
      expect(cappedCount(counts[1])).toBe(`${QUEUE_COUNT_CAP}+`);
      expect(cappedSum(counts)).toEqual({ n: QUEUE_COUNT_CAP + 1, label: `${QUEUE_COUNT_CAP + 1}+` });

      const first = await listQueue(reviewer, { tier: 1 });
      expect(first).toMatchObject({ total: QUEUE_COUNT_CAP, more: true, hasNext: true });
      const lastPage = Math.ceil(n / QUEUE_PAGE_SIZE);
      const last = await listQueue(reviewer, { tier: 1, page: lastPage });
      expect(last.hasNext).toBe(false);
      expect(last.rows.map((r) => r.id)).toEqual(ids.slice((lastPage - 1) * QUEUE_PAGE_SIZE));
      const beforeLast = await listQueue(reviewer, { tier: 1, page: lastPage - 1 });
      expect(beforeLast.hasNext).toBe(true);

      // Under the cap the count is exact and says so.
      const tier2 = await listQueue(reviewer, { tier: 2 });
      expect(tier2).toMatchObject({ total: 1, more: false, hasNext: false });
    },
  );

  it("counts what waits for this user by tier", async () => {
    const team = await createTeam();
    for (const tier of [1, 2, 2, 3, 4] as const) await createSubmittedApplication({ applicant: team.instructor, tier });
    await createSubmittedApplication({ applicant: team.instructor, tier: 0 });
    expect(await queueCountsByTier(asActor(team.reviewer))).toEqual({ 0: 0, 1: 1, 2: 2, 3: 1, 4: 1 });
    expect(await queueCountsByTier(asActor(team.instructor))).toEqual({ 0: 0, 1: 0, 2: 0, 3: 0, 4: 0 });
    const officerBefore = await queueCountsByTier(asActor(team.officer));
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 4 });
    await decide(asActor(team.reviewer), application.id, { kind: "recommend", expectedVersion: application.version });
    const officerAfter = await queueCountsByTier(asActor(team.officer));
    expect(officerAfter[4]).toBe(officerBefore[4] + 1);
    expect(await queueCountsByTier(asActor(team.reviewer))).toEqual({ 0: 0, 1: 1, 2: 2, 3: 1, 4: 1 });
  });

  it("tolerates a tier-0 application left in the submitted state: listed for everyone, waiting for nobody", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 1 });
    // As if submitted by a path that did not self-certify it.
    await getDb().update(applications).set({ tier: 0 }).where(eq(applications.id, application.id));
    const all = await listQueue(asActor(team.officer), { scope: "all", departmentId: team.dept.id });
    expect(all.rows.find((r) => r.id === application.id)).toMatchObject({ pendingRole: null, actionable: false });
    expect((await listQueue(asActor(team.reviewer))).rows.map((r) => r.id)).not.toContain(application.id);
    expect((await queueCountsByTier(asActor(team.reviewer)))[0]).toBe(0);
    const refused = await decide(asActor(team.reviewer), application.id, {
      kind: "approve",
      expectedVersion: application.version,
      password: TEST_PASSWORD,
      confirmedRequirements: [],
      extraConditions: [],
    }).catch((e: AppError) => e);
    expect(refused).toBeInstanceOf(AppError);
    expect((refused as AppError).status).toBe(409);
  });

  it("shows nothing to a user without the review permission", async () => {
    const instructor = await createUser({ roles: ["instructor"] });
    expect((await listQueue(asActor(instructor), { scope: "all" })).rows).toEqual([]);
  });
});
