// The daily permit job: which reminder is due when (calendar arithmetic in the institution's time
// zone), that each goes out once whatever runs it and however often, and that renewed and revoked
// permits get none. Runs against the test database and the real local inbox.
//
// Every injected clock is at or before the real present, so the job never expires another test's
// permit early: a run "as of yesterday" only touches permits that had ended by yesterday.
import { and, desc, eq, like } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, courseTypes, mailOutbox, permits, ruleSets, trainingRecords } from "@/db/schema";
import { runReminders } from "@/lib/jobs/actions";
import { instantAt } from "@/lib/jobs/clock";
import { reminderDue, reminderKey } from "@/lib/jobs/reminders";
import { startWorker } from "@/lib/jobs/worker";
import { deliverDueMail } from "@/lib/mail/actions";
import { addDays, todayIn } from "@/lib/permits/dates";
import { createDepartment, createUser, requireDatabase, uniq } from "../support/db";
import { caughtTo, createPermitFixture, outboxIdsTo, outboxRowsTo, runChild, useTimeZone, waitFor } from "./support";

requireDatabase();

const SCHEDULE = [30, 7, 1, 0];
const realToday = todayIn("UTC", new Date());

describe("reminderDue: which reminder a permit is due on a given day", () => {
  // A permit valid through 30 June 2026, issued 1 March 2026. "N days before expiry" is due on
  // validTo + 1 − N (expiry is the end of the last valid day): 30 → 1 June, 7 → 24 June,
  // 1 → 30 June (the last valid day), 0 → 1 July (the first day it is expired).
  const permit = { validTo: "2026-06-30", issuedOn: "2026-03-01", schedule: SCHEDULE };

  it("is due on 1 June (30 days left), 24 June (7), 30 June (last day) and 1 July (expired)", () => {
    expect(reminderDue({ ...permit, today: "2026-06-01" })).toEqual({
      threshold: 30,
      kind: "30d",
      dueDate: "2026-06-01",
      daysLeft: 30,
    });
    expect(reminderDue({ ...permit, today: "2026-06-24" })).toEqual({
      threshold: 7,
      kind: "7d",
      dueDate: "2026-06-24",
      daysLeft: 7,
    });
    expect(reminderDue({ ...permit, today: "2026-06-30" })).toEqual({
      threshold: 1,
      kind: "1d",
      dueDate: "2026-06-30",
      daysLeft: 1,
    });
    expect(reminderDue({ ...permit, today: "2026-07-01" })).toEqual({
      threshold: 0,
      kind: "expired",
      dueDate: "2026-07-01",
      daysLeft: 0,
    });
  });

  it("has nothing due before the first reminder's day", () => {
    expect(reminderDue({ ...permit, today: "2026-05-31" })).toBeNull();
  });

  it("between reminders names the last one that came due, whose key was already used, so nothing new is sent", () => {
    // 3 June: the 30-day reminder (due 1 June) is still the most recent one due, with the same key.
    expect(reminderDue({ ...permit, today: "2026-06-03" })).toMatchObject({ kind: "30d", dueDate: "2026-06-01" });
    // 10 June: more than 7 days after it, nothing is due.
    expect(reminderDue({ ...permit, today: "2026-06-10" })).toBeNull();
  });

  it("catches up a reminder missed by up to 7 days, but not an older one", () => {
    expect(reminderDue({ ...permit, today: "2026-07-08" })?.kind).toBe("expired");
    expect(reminderDue({ ...permit, today: "2026-07-09" })).toBeNull();
  });

  it("skips a reminder that came due on or before the day the permit was issued", () => {
    // Issued 20 June with 10 days left: the 30-day reminder's day (1 June) was before it existed.
    expect(reminderDue({ ...permit, issuedOn: "2026-06-20", today: "2026-06-21" })).toBeNull();
    expect(reminderDue({ ...permit, issuedOn: "2026-06-24", today: "2026-06-24" })).toBeNull();
    expect(reminderDue({ ...permit, issuedOn: "2026-06-20", today: "2026-06-24" })?.kind).toBe("7d");
  });

  it("follows a custom schedule", () => {
    // 14 days before expiry of a permit valid through 30 June: due 17 June, caught up until 24 June.
    expect(reminderDue({ ...permit, schedule: [14], today: "2026-06-17" })).toMatchObject({
      kind: "14d",
      daysLeft: 14,
    });
    expect(reminderDue({ ...permit, schedule: [14], today: "2026-06-24" })).toMatchObject({
      kind: "14d",
      dueDate: "2026-06-17",
    });
    expect(reminderDue({ ...permit, schedule: [14], today: "2026-06-25" })).toBeNull();
  });
});

describe("instantAt: a wall-clock time in a time zone", () => {
  it("finds 06:00 local on a given day across zones and daylight-saving changes", () => {
    // Reference offsets: IANA tzdata — Auckland NZST +12 in June, NZDT +13 in January; New York
    // EDT −4 on 8 March 2026 (the day DST starts), Kolkata +5:30 all year.
    expect(instantAt("2026-06-15", "Pacific/Auckland", 6).toISOString()).toBe("2026-06-14T18:00:00.000Z");
    expect(instantAt("2026-01-15", "Pacific/Auckland", 6).toISOString()).toBe("2026-01-14T17:00:00.000Z");
    expect(instantAt("2026-03-08", "America/New_York", 6).toISOString()).toBe("2026-03-08T10:00:00.000Z");
    expect(instantAt("2026-03-01", "Asia/Kolkata", 6).toISOString()).toBe("2026-03-01T00:30:00.000Z");
  });
});

describe("the daily permit job", () => {
  const restore: (() => Promise<void>)[] = [];
  afterAll(async () => {
    for (const r of restore.reverse()) await r();
  });

  // The job runs "as of" noon UTC of a day in the recent past; permits are placed relative to it.
  const jobDay = addDays(realToday, -1);
  const jobNow = new Date(`${jobDay}T12:00:00Z`);

  it("queues each reminder once to the holder, and on expiry also to the reviewer who signed; re-runs queue nothing", async () => {
    restore.push(await useTimeZone("UTC"));
    const thirty = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, 29) });
    const seven = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, 6) });
    const lastDay = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: jobDay });
    const ended = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, -1) });
    const quiet = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, 20) });

    const first = await runReminders({ now: jobNow });
    expect(first.today).toBe(jobDay);
    const kinds = Object.fromEntries(
      first.queued
        .filter((q) => [thirty, seven, lastDay, ended, quiet].some((f) => f.permit.id === q.permitId))
        .map((q) => [q.permitId, q.kind]),
    );
    expect(kinds).toEqual({
      [thirty.permit.id]: "30d",
      [seven.permit.id]: "7d",
      [lastDay.permit.id]: "1d",
      [ended.permit.id]: "expired",
    });

    // The expiry notice goes to the holder and to the reviewer who signed step 1; the others to the holder only.
    expect((await outboxRowsTo([ended.holder.email, ended.reviewer.email])).map((r) => r.toAddress).sort()).toEqual(
      [ended.holder.email, ended.reviewer.email].sort(),
    );
    expect(await outboxRowsTo([seven.reviewer.email, seven.operator.email])).toEqual([]);
    const [sevenRow] = await outboxRowsTo([seven.holder.email]);
    expect(sevenRow.dedupeKey).toBe(
      `${reminderKey(seven.permit.id, { kind: "7d", dueDate: jobDay })}:${seven.holder.email.toLowerCase()}`,
    );
    expect(sevenRow.data).toMatchObject({ daysLeft: 7, recipient: "holder", validTo: addDays(jobDay, 6) });
    expect(await outboxRowsTo([quiet.holder.email])).toEqual([]);

    // Same day again, and the next day: nothing new for these permits.
    const again = await runReminders({ now: jobNow });
    const ids = new Set([thirty, seven, lastDay, ended].map((f) => f.permit.id));
    expect(again.queued.filter((q) => ids.has(q.permitId))).toEqual([]);
    const later = await runReminders({ now: new Date(jobNow.getTime() + 6 * 3600_000) });
    expect(later.queued.filter((q) => ids.has(q.permitId))).toEqual([]);

    // Delivered: one message per recipient, each with an HTML and a text part. Only these rows are
    // sent: other test files queue mail into the same outbox meanwhile.
    const recipients = [
      thirty.holder.email,
      seven.holder.email,
      lastDay.holder.email,
      ended.holder.email,
      ended.reviewer.email,
    ];
    await deliverDueMail({ ids: (await Promise.all(recipients.map(outboxIdsTo))).flat() });
    for (const address of recipients) {
      const caught = caughtTo(address);
      expect(caught, address).toHaveLength(1);
      expect(caught[0].html).toContain("/permits/");
      expect(caught[0].text).toContain("/permits/");
    }
    expect(caughtTo(seven.holder.email)[0].subject).toBe(`Permit ${seven.permit.number}: 7 days left`);
    expect(caughtTo(lastDay.holder.email)[0].subject).toBe(`Permit ${lastDay.permit.number}: last valid day today`);
    expect(caughtTo(ended.reviewer.email)[0].text).toContain("you signed the review");
  });

  it("stores expired for an active permit whose last valid day has passed, with one audit row", async () => {
    const ended = await createPermitFixture({ validFrom: addDays(jobDay, -40), validTo: addDays(jobDay, -3) });
    const first = await runReminders({ now: jobNow });
    expect(first.expired).toContain(ended.permit.id);
    const [row] = await getDb().select({ state: permits.state }).from(permits).where(eq(permits.id, ended.permit.id));
    expect(row.state).toBe("expired");
    const second = await runReminders({ now: jobNow });
    expect(second.expired).not.toContain(ended.permit.id);
    const audits = await getDb()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, ended.permit.id), eq(auditEvents.action, "permit.expired")));
    expect(audits).toHaveLength(1);
  });

  it("sends no reminders for a renewed or a revoked permit", async () => {
    const renewed = await createPermitFixture({
      validFrom: addDays(jobDay, -60),
      validTo: addDays(jobDay, 6),
      renewed: true,
    });
    const revoked = await createPermitFixture({
      validFrom: addDays(jobDay, -60),
      validTo: addDays(jobDay, 6),
      state: "revoked",
    });
    const report = await runReminders({ now: jobNow });
    expect(report.queued.map((q) => q.permitId)).not.toContain(renewed.permit.id);
    expect(report.queued.map((q) => q.permitId)).not.toContain(revoked.permit.id);
    expect(await outboxRowsTo([renewed.holder.email, revoked.holder.email])).toEqual([]);
  });

  it("follows the newest reminder rule set", async () => {
    const db = getDb();
    const [newest] = await db
      .select({ version: ruleSets.version })
      .from(ruleSets)
      .where(eq(ruleSets.kind, "reminders"))
      .orderBy(desc(ruleSets.version))
      .limit(1);
    const version = (newest?.version ?? 0) + 1000;
    await db
      .insert(ruleSets)
      .values({ kind: "reminders", version, rules: { daysBefore: [14] }, note: "test: 14 days only" });
    try {
      const fourteen = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, 13) });
      const seven = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, 6) });
      const report = await runReminders({ now: jobNow });
      expect(report.schedule).toEqual([14]);
      const mine = report.queued.filter((q) => [fourteen.permit.id, seven.permit.id].includes(q.permitId));
      // The 7-day permit's 14-day reminder came due a week ago: caught up, as the most recent one.
      expect(mine.map((q) => [q.permitId, q.kind, q.dueDate]).sort()).toEqual(
        [
          [fourteen.permit.id, "14d", jobDay],
          [seven.permit.id, "14d", addDays(jobDay, -7)],
        ].sort(),
      );
    } finally {
      await db.delete(ruleSets).where(and(eq(ruleSets.kind, "reminders"), eq(ruleSets.version, version)));
    }
  });

  it("reminds of a course that lapses in 7 days, to the person and a safety officer, once", async () => {
    const dept = await createDepartment();
    const person = await createUser({ roles: ["instructor"], departmentId: dept.id });
    const officer = await createUser({ roles: ["safety_officer"], departmentId: dept.id });
    const [course] = await getDb()
      .insert(courseTypes)
      .values({ name: uniq("Course"), validityMonths: 12, minTier: 2, departmentId: dept.id })
      .returning();
    // Completed a year before the day that is 7 days after the job's day: the 7-day reminder is due.
    const lapse = addDays(jobDay, 7);
    const completedOn = `${Number(lapse.slice(0, 4)) - 1}${lapse.slice(4)}`.replace(/-02-29$/, "-02-28");
    await getDb().insert(trainingRecords).values({
      userId: person.id,
      courseTypeId: course.id,
      completedOn,
      trainer: "Safety office",
      recordedById: officer.id,
    });

    const first = await runReminders({ now: jobNow });
    const mine = first.training.filter((t) => t.userId === person.id);
    expect(mine).toHaveLength(1);
    expect(mine[0].to).toEqual(expect.arrayContaining([person.email, officer.email]));
    const again = await runReminders({ now: jobNow });
    expect(again.training.filter((t) => t.userId === person.id)).toEqual([]);
    const rows = await getDb()
      .select({ to: mailOutbox.toAddress })
      .from(mailOutbox)
      .where(like(mailOutbox.dedupeKey, `training:${person.id}:${course.id}:%`));
    expect(rows.filter((r) => r.to === person.email)).toHaveLength(1);
    expect(rows.filter((r) => r.to === officer.email)).toHaveLength(1);
  });

  it("counts days in the institution's time zone: the day turns at local midnight", async () => {
    // Day D in Auckland ends at local midnight, which is 11:00 or 12:00 UTC on D (NZDT +13 / NZST +12).
    const d = addDays(realToday, -2);
    const midnight = instantAt(addDays(d, 1), "Pacific/Auckland", 0);
    const before = new Date(midnight.getTime() - 30 * 60_000);
    const after = new Date(midnight.getTime() + 30 * 60_000);
    // Its 7-day reminder is due on D + 1.
    const permit = await createPermitFixture({ validFrom: addDays(d, -60), validTo: addDays(d, 7) });
    const mine = (r: Awaited<ReturnType<typeof runReminders>>) =>
      r.queued.filter((q) => q.permitId === permit.permit.id);

    restore.push(await useTimeZone("UTC"));
    // In UTC, `after` is still day D: nothing is due yet.
    const utc = await runReminders({ now: after });
    expect(utc.today).toBe(d);
    expect(mine(utc)).toEqual([]);

    await useTimeZone("Pacific/Auckland");
    const justBefore = await runReminders({ now: before });
    expect(justBefore.today).toBe(d);
    expect(mine(justBefore)).toEqual([]);
    const justAfter = await runReminders({ now: after });
    expect(justAfter.today).toBe(addDays(d, 1));
    expect(mine(justAfter).map((q) => [q.kind, q.dueDate])).toEqual([["7d", addDays(d, 1)]]);
    await useTimeZone("UTC");
  });
});

describe("the daily permit job on several workers", () => {
  const jobDay = addDays(realToday, -1);
  const jobNow = new Date(`${jobDay}T12:00:00Z`).toISOString();

  it("two worker processes running it at the same moment queue and deliver one mail per key", async () => {
    const fixtures = await Promise.all([
      createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, 6) }),
      createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, -1) }),
    ]);
    const recipients = [fixtures[0].holder.email, fixtures[1].holder.email, fixtures[1].reviewer.email];
    const to = ["--to", recipients.join(",")];
    const [a, b] = await Promise.all([
      runChild("worker-child", ["--reminders-at", jobNow, "--deliver", ...to]),
      runChild("worker-child", ["--reminders-at", jobNow, "--deliver", ...to]),
    ]);
    expect(a.code, a.stderr).toBe(0);
    expect(b.code, b.stderr).toBe(0);
    for (const address of recipients) {
      expect(await outboxRowsTo([address]), address).toHaveLength(1);
      expect(caughtTo(address), address).toHaveLength(1);
    }
    // Between them the two processes queued each reminder once.
    const queuedBy = (r: typeof a) =>
      (JSON.parse(r.stdout.trim().split("\n").pop()!).reminders.queued as { permitId: string; to: string[] }[])
        .filter((q) => fixtures.some((f) => f.permit.id === q.permitId))
        .flatMap((q) => q.to);
    expect([...queuedBy(a), ...queuedBy(b)].sort()).toEqual([...recipients].sort());
  });

  it("a worker killed after the server accepted a reminder, then a new worker: exactly one mail", async () => {
    const fixture = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, 6) });
    await runReminders({ now: new Date(jobNow) });
    const [row] = await outboxRowsTo([fixture.holder.email]);
    const killed = await runChild("worker-child", [
      ...["--deliver", "--to", fixture.holder.email],
      ...["--kill-at", "accepted", "--rows", String(row.id)],
    ]);
    expect(killed.signal).toBe("SIGKILL");
    expect(caughtTo(fixture.holder.email)).toHaveLength(1);
    // Recovery: the job again and a fresh worker. Nothing is queued or sent twice.
    const recovery = await runChild("worker-child", [
      "--reminders-at",
      jobNow,
      "--deliver",
      "--to",
      fixture.holder.email,
    ]);
    expect(recovery.code, recovery.stderr).toBe(0);
    expect(await outboxRowsTo([fixture.holder.email])).toHaveLength(1);
    expect(caughtTo(fixture.holder.email)).toHaveLength(1);
  });

  it("a worker killed mid-send, before its transaction committed: the recovery sends the reminder exactly once", async () => {
    const fixture = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, 29) });
    await runReminders({ now: new Date(jobNow) });
    const [row] = await outboxRowsTo([fixture.holder.email]);
    const killed = await runChild("worker-child", [
      ...["--deliver", "--to", fixture.holder.email],
      ...["--kill-at", "data", "--rows", String(row.id)],
    ]);
    expect(killed.signal).toBe("SIGKILL");
    // The server had the message but not its final dot: it discarded it. The row is still queued.
    expect(caughtTo(fixture.holder.email)).toHaveLength(0);
    const [after] = await outboxRowsTo([fixture.holder.email]);
    expect(after.status).toBe("queued");
    const recovery = await runChild("worker-child", [
      "--reminders-at",
      jobNow,
      "--deliver",
      "--to",
      fixture.holder.email,
    ]);
    expect(recovery.code, recovery.stderr).toBe(0);
    expect(caughtTo(fixture.holder.email)).toHaveLength(1);
  });

  it("the pg-boss worker runs the job on demand and delivers each reminder once, however often it is asked", async () => {
    const fixture = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: jobDay });
    const worker = await startWorker({
      schedule: false,
      pollMs: 200,
      log: () => {},
      outboxIds: () => outboxIdsTo(fixture.holder.email),
    });
    try {
      await worker.requestReminders(new Date(jobNow));
      const caught = await waitFor(() =>
        caughtTo(fixture.holder.email).length > 0 ? caughtTo(fixture.holder.email) : null,
      );
      expect(caught[0].subject).toContain("last valid day today");
      await worker.requestReminders(new Date(jobNow));
      await worker.requestReminders(new Date(jobNow));
      // Give the worker time to run both requests and flush (poll 200 ms, job polling 1–2 s).
      await new Promise((r) => setTimeout(r, 5_000));
      expect(caughtTo(fixture.holder.email)).toHaveLength(1);
      const audits = await getDb()
        .select()
        .from(auditEvents)
        .where(and(eq(auditEvents.entityId, fixture.permit.id), like(auditEvents.action, "permit.reminder%")));
      expect(audits).toHaveLength(1);
    } finally {
      await worker.stop();
    }
  });
});
