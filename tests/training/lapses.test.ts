import { eq, like } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { courseTypes, mailOutbox, permits, trainingRecords } from "@/db/schema";
import { decide } from "@/lib/review/decide";
import { approvalRequirements, audienceFactsOf, DEFAULT_CHAIN_RULES } from "@/lib/rules/chain";
import { runTrainingReminders } from "@/lib/training/reminders";
import {
  asActor,
  createOfficer,
  createSubmittedApplication,
  createTeam,
  currentVersion,
  isoDayFromNow,
} from "../review/support";
import { createUser, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { http, signIn } from "../support/http";

requireDatabase();

// Reminders before a course lapses (once per person, course, lapse day and threshold, to the person
// and the safety officers), and the flag on an active permit whose operator's training lapses before
// its last day (issue 17, item 1).

type Team = Awaited<ReturnType<typeof createTeam>>;

async function course(departmentId: string, validityMonths: number, minTier = 2) {
  const [row] = await getDb()
    .insert(courseTypes)
    .values({ name: uniq("Course"), validityMonths, minTier, departmentId })
    .returning();
  return row;
}

async function completed(userId: string, courseTypeId: string, completedOn: string, recordedById: string) {
  await getDb()
    .insert(trainingRecords)
    .values({ userId, courseTypeId, completedOn, trainer: "Safety office", recordedById });
}

describe("training lapses", () => {
  let team: Team;
  beforeAll(async () => {
    team = await createTeam();
  });

  it("reminds the person and the safety officers 30 and 7 days before a course lapses, each once", async () => {
    const person = await createUser({ roles: ["instructor"], departmentId: team.dept.id });
    const officer = await createOfficer({ departmentId: team.office.id });
    const triennial = await course(team.dept.id, 36);
    // Completed 2020-05-10, valid 36 months: lapses 2023-05-10 (calendar). 2023-04-10 is 30 days
    // before it (April has 30 days), 2023-05-03 is 7 days before it.
    await completed(person.id, triennial.id, "2020-05-10", team.officer.id);
    const key = `training:${person.id}:${triennial.id}:2023-05-10:`;
    const rowsFor = async () =>
      getDb()
        .select({ to: mailOutbox.toAddress, key: mailOutbox.dedupeKey, data: mailOutbox.data })
        .from(mailOutbox)
        .where(like(mailOutbox.dedupeKey, `${key}%`));

    expect(await runTrainingReminders("2023-04-09")).not.toContainEqual(expect.objectContaining({ userId: person.id }));
    expect(await rowsFor()).toEqual([]);

    await runTrainingReminders("2023-04-10");
    await runTrainingReminders("2023-04-10");
    await runTrainingReminders("2023-04-12");
    const first = await rowsFor();
    const to = first.map((r) => r.to.toLowerCase());
    expect(to.filter((a) => a === person.email.toLowerCase())).toHaveLength(1);
    expect(to.filter((a) => a === officer.email.toLowerCase())).toHaveLength(1);
    expect(first.every((r) => r.key!.startsWith(`${key}30d:`))).toBe(true);
    expect(first.find((r) => r.to === person.email)?.data).toMatchObject({ daysLeft: 30, recipient: "person" });

    await runTrainingReminders("2023-05-03");
    await runTrainingReminders("2023-05-03");
    const second = (await rowsFor()).filter((r) => r.key!.startsWith(`${key}7d:`));
    expect(second.filter((r) => r.to === person.email)).toHaveLength(1);
    expect(second.find((r) => r.to === person.email)?.data).toMatchObject({ daysLeft: 7 });
    // Lapsed: no more reminders.
    await runTrainingReminders("2023-05-10");
    expect(await rowsFor()).toHaveLength(first.length + second.length);
  });

  it("flags an active permit whose operator's course lapses before its last day, on the permit page and the dashboard", async () => {
    // A department of its own: the course above is required in this file's first department.
    const team = await createTeam();
    const operator = await createUser({ roles: ["instructor"], departmentId: team.dept.id });
    const fixture = await createSubmittedApplication({
      applicant: team.instructor,
      tier: 2,
      operators: [{ id: operator.id, name: operator.name }],
      namedUserIds: [operator.id],
      firstDay: isoDayFromNow(1),
      lastDay: isoDayFromNow(20),
    });
    await decide(asActor(team.reviewer), fixture.application.id, {
      kind: "recommend",
      expectedVersion: fixture.application.version,
    });
    const approval = await decide(asActor(team.officer), fixture.application.id, {
      kind: "approve",
      expectedVersion: await currentVersion(fixture.application.id),
      password: TEST_PASSWORD,
      confirmedRequirements: approvalRequirements(DEFAULT_CHAIN_RULES, 2, audienceFactsOf(fixture.content)).map(
        (r) => r.id,
      ),
      extraConditions: [],
    });
    const permit = approval.permit!;
    // A course made required after the approval, which the operator completed 12 months and 5 days
    // before five days from now: it lapses five days from now, inside the permit's 20 days.
    const yearly = await course(team.dept.id, 12);
    const now = new Date();
    const completedOn = new Date(Date.UTC(now.getUTCFullYear() - 1, now.getUTCMonth(), now.getUTCDate() + 5))
      .toISOString()
      .slice(0, 10);
    await completed(operator.id, yearly.id, completedOn, team.officer.id);
    const lapsesOn = isoDayFromNow(5);

    const holder = await signIn(team.instructor.email);
    const page = await http(`/permits/${permit.id}`, { cookie: holder });
    expect(page.status).toBe(200);
    expect(page.text).toContain("Operator training lapses while this permit is active");
    expect(page.text.replace(/<!-- -->/g, "")).toContain(`${yearly.name} lapses on ${lapsesOn}`);

    const dashboard = await http("/", { cookie: await signIn(team.officer.email) });
    expect(dashboard.status).toBe(200);
    const section = dashboard.text.replace(/<!-- -->/g, "");
    expect(section).toContain("Operator training lapses under active permits");
    expect(section).toContain(permit.number);

    // Recorded again today: current through the permit's last day, the flag is gone.
    await completed(operator.id, yearly.id, isoDayFromNow(0), team.officer.id);
    const after = await http(`/permits/${permit.id}`, { cookie: holder });
    expect(after.text).not.toContain("Operator training lapses while this permit is active");
    const [stored] = await getDb().select({ state: permits.state }).from(permits).where(eq(permits.id, permit.id));
    expect(stored.state).toBe("active");
  });
});
