import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applications } from "@/db/schema";
import { submitApplication } from "@/lib/applications/actions";
import { AppError } from "@/lib/errors";
import { instantAt } from "@/lib/jobs/clock";
import { runReminders } from "@/lib/jobs/actions";
import { inspectionStatus } from "@/lib/upkeep/due";
import { completeDraft, pngBytes } from "../applications/support";
import { asActor } from "../review/support";
import { createDepartment, createUser, requireDatabase } from "../support/db";
import { http, signIn } from "../support/http";
import { auditActions, mailsWithKey, uploadTo } from "../incidents/support";

requireDatabase();

// Apparatus upkeep over HTTP against the production build: inspection and maintenance records with a
// photo, the inspection interval and its once-only reminder from the daily job, and retiring an
// apparatus (kept, shown as retired, refused for a new application).

/** 4.7 nF at 10 kV: tier 1 (Q = 47 µC, E = 0.235 J; hazard-model.md's default table). */
const SETUP = { sources: [{ id: "C1", kind: "capacitor", capacitance_F: 4.7e-9, voltage_V: 10_000 }] };

describe("apparatus upkeep", () => {
  let owner: Awaited<ReturnType<typeof createUser>>;
  let colleague: Awaited<ReturnType<typeof createUser>>;
  let stranger: Awaited<ReturnType<typeof createUser>>;
  const cookie = { owner: "", colleague: "", stranger: "" };

  beforeAll(async () => {
    const dept = await createDepartment();
    owner = await createUser({ roles: ["instructor"], departmentId: dept.id });
    colleague = await createUser({ roles: ["reviewer"], departmentId: dept.id });
    stranger = await createUser({ roles: ["instructor"], departmentId: (await createDepartment()).id });
    cookie.owner = await signIn(owner.email);
    cookie.colleague = await signIn(colleague.email);
    cookie.stranger = await signIn(stranger.email);
  });

  async function newApparatus(name = "Jar bank for upkeep") {
    const res = await http("/api/apparatus", {
      method: "POST",
      cookie: cookie.owner,
      body: { name, room: "B12", notes: "", setup: SETUP },
    });
    expect(res.status, res.text).toBe(201);
    return res.json!.apparatus.id as string;
  }

  it("computes the next due day from the last passing inspection", () => {
    // Calendar arithmetic (memory): 10 January + 30 days = 9 February (January has 31 days).
    expect(
      inspectionStatus({
        intervalDays: 30,
        lastPassedOn: "2026-01-10",
        registeredOn: "2025-06-01",
        today: "2026-02-08",
      }),
    ).toEqual({ dueOn: "2026-02-09", daysLeft: 1, state: "due_soon" });
    // 2028 is a leap year (memory): 1 February + 365 days = 31 January 2029.
    expect(
      inspectionStatus({
        intervalDays: 365,
        lastPassedOn: "2028-02-01",
        registeredOn: "2025-06-01",
        today: "2028-03-01",
      })?.dueOn,
    ).toBe("2029-01-31");
    // Never inspected: counted from the day it was registered.
    expect(
      inspectionStatus({ intervalDays: 90, lastPassedOn: null, registeredOn: "2026-01-01", today: "2026-06-01" }),
    ).toMatchObject({ dueOn: "2026-04-01", state: "due" });
    expect(
      inspectionStatus({ intervalDays: null, lastPassedOn: null, registeredOn: "2026-01-01", today: "2026-06-01" }),
    ).toBeNull();
  });

  it("records inspections with a photo, answers 422 naming the field, and keeps strangers out", async () => {
    const id = await newApparatus();
    const url = `/api/apparatus/${id}/inspections`;
    const good = {
      kind: "bleeder",
      inspectedOn: "2026-01-10",
      inspectedBy: "Opal Fenwick",
      result: "pass",
      note: "498 MΩ",
    };
    const cases: [Record<string, unknown>, string][] = [
      [{ ...good, kind: "vibes" }, "kind"],
      [{ ...good, inspectedOn: "10/01/2026" }, "inspectedOn"],
      [{ ...good, inspectedOn: "2026-02-30" }, "inspectedOn"],
      [{ ...good, inspectedOn: "2999-01-01" }, "inspectedOn"],
      [{ ...good, inspectedBy: " " }, "inspectedBy"],
      [{ ...good, result: "ok" }, "result"],
    ];
    for (const [body, path] of cases) {
      const res = await http(url, { method: "POST", cookie: cookie.owner, body });
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.json?.error.issues.map((i: { path: string }) => i.path)).toContain(path);
    }
    expect((await http(url, { method: "POST", cookie: cookie.stranger, body: good })).status).toBe(404);
    const ok = await http(url, { method: "POST", cookie: cookie.colleague, body: good });
    expect(ok.status).toBe(201);
    const inspectionId = ok.json?.inspection.id as string;
    const photoUrl = `${url}/${inspectionId}/photo`;
    const png = pngBytes(10, 10);
    expect((await uploadTo(cookie.owner, photoUrl, Buffer.from("not an image"), "x.png", "image/png")).status).toBe(
      422,
    );
    expect((await uploadTo(cookie.owner, photoUrl, png, "hook.png", "image/png")).status).toBe(201);
    // One photo per record.
    expect((await uploadTo(cookie.owner, photoUrl, png, "again.png", "image/png")).status).toBe(409);
    const list = await http(url, { cookie: cookie.owner });
    expect(list.json?.records).toHaveLength(1);
    expect(list.json?.records[0]).toMatchObject({
      kind: "bleeder",
      result: "pass",
      inspectedBy: "Opal Fenwick",
      photo: "hook.png",
    });
    expect(await auditActions("apparatus", id)).toEqual([
      "apparatus.created",
      "apparatus.inspection_recorded",
      "apparatus.inspection_photo_added",
    ]);
  });

  it("reminds the owner once when an inspection falls due, through the daily job", async () => {
    const id = await newApparatus("Bank with a 30-day interval");
    const interval = await http(`/api/apparatus/${id}/upkeep`, {
      method: "PATCH",
      cookie: cookie.owner,
      body: { inspectionInterval_days: 30 },
    });
    expect(interval.status).toBe(200);
    const bad = await http(`/api/apparatus/${id}/upkeep`, {
      method: "PATCH",
      cookie: cookie.owner,
      body: { inspectionInterval_days: 0 },
    });
    expect(bad.status).toBe(422);
    expect(bad.json?.error.issues[0].path).toBe("inspectionInterval_days");
    await http(`/api/apparatus/${id}/inspections`, {
      method: "POST",
      cookie: cookie.owner,
      body: { kind: "jars_insulation", inspectedOn: "2026-01-10", inspectedBy: owner.name, result: "pass" },
    });
    // A failed inspection later does not restart the clock.
    await http(`/api/apparatus/${id}/inspections`, {
      method: "POST",
      cookie: cookie.owner,
      body: { kind: "grounding_hook", inspectedOn: "2026-01-20", inspectedBy: owner.name, result: "fail" },
    });
    const key = `inspection_due:${id}:`;
    // 10 January + 30 days = 9 February (see above): nothing the day before, one e-mail on the day.
    const before = await runReminders({ now: instantAt("2026-02-08", "UTC", 6) });
    expect(before.inspections.map((r) => r.apparatusId)).not.toContain(id);
    expect(await mailsWithKey("inspection_due", key)).toHaveLength(0);
    const onTheDay = await runReminders({ now: instantAt("2026-02-09", "UTC", 6) });
    expect(onTheDay.inspections.filter((r) => r.apparatusId === id)).toEqual([
      { apparatusId: id, name: "Bank with a 30-day interval", dueOn: "2026-02-09", to: [owner.email] },
    ]);
    await runReminders({ now: instantAt("2026-02-09", "UTC", 6) });
    await runReminders({ now: instantAt("2026-02-12", "UTC", 6) });
    const mails = await mailsWithKey("inspection_due", key);
    expect(mails.map((m) => [m.to, m.key])).toEqual([[owner.email, `inspection_due:${id}:2026-02-09:${owner.email}`]]);
    expect(await auditActions("apparatus", id)).toContain("apparatus.inspection_reminder_queued");
  });

  it("retires an apparatus: kept and shown as retired, refused for a new application and for edits", async () => {
    const id = await newApparatus("Old induction coil");
    // A draft started from it before it was retired.
    const draft = completeDraft({ id: owner.id, name: owner.name });
    const [app] = await getDb()
      .insert(applications)
      .values({
        title: draft.event.title,
        applicantId: owner.id,
        departmentId: owner.departmentId!,
        draft: { ...draft, apparatus: { ...draft.apparatus, apparatusId: id } },
        tier: 2,
        namedUserIds: [owner.id],
      })
      .returning({ id: applications.id, version: applications.version });

    const empty = await http(`/api/apparatus/${id}/retire`, {
      method: "POST",
      cookie: cookie.owner,
      body: { reason: "" },
    });
    expect(empty.status).toBe(422);
    expect(empty.json?.error.issues[0].path).toBe("reason");
    expect(
      (await http(`/api/apparatus/${id}/retire`, { method: "POST", cookie: cookie.stranger, body: { reason: "x" } }))
        .status,
    ).toBe(404);
    const retired = await http(`/api/apparatus/${id}/retire`, {
      method: "POST",
      cookie: cookie.owner,
      body: { reason: "Secondary winding insulation cracked." },
    });
    expect(retired.status).toBe(200);
    expect(
      (await http(`/api/apparatus/${id}/retire`, { method: "POST", cookie: cookie.owner, body: { reason: "x" } }))
        .status,
    ).toBe(409);
    expect(await auditActions("apparatus", id)).toContain("apparatus.retired");

    // Kept for the record: its page and API still answer, marked retired.
    const page = await http(`/apparatus/${id}`, { cookie: cookie.owner });
    expect(page.status).toBe(200);
    expect(page.text).toContain("Retired");
    expect(page.text).toContain("Secondary winding insulation cracked.");
    const upkeep = await http(`/api/apparatus/${id}/inspections`, { cookie: cookie.owner });
    expect(upkeep.json?.retired.reason).toBe("Secondary winding insulation cracked.");

    // No longer offered: a new draft from it and a submission naming it are refused, naming the field.
    const fresh = await http("/api/applications", { method: "POST", cookie: cookie.owner, body: { apparatusId: id } });
    expect(fresh.status).toBe(422);
    expect(fresh.json?.error.issues[0].path).toBe("apparatusId");
    const submitted = await submitApplication(asActor(owner), app.id, app.version).catch((e: unknown) => e);
    expect(submitted).toBeInstanceOf(AppError);
    expect((submitted as AppError).details.issues?.map((i) => i.path)).toContain("apparatus.apparatusId");
    // Nor edited, nor given an interval.
    const edit = await http(`/api/apparatus/${id}`, {
      method: "PATCH",
      cookie: cookie.owner,
      body: { name: "Old induction coil", room: "B12", notes: "", setup: SETUP, expectedRevision: 1 },
    });
    expect(edit.status).toBe(409);
    const interval = await http(`/api/apparatus/${id}/upkeep`, {
      method: "PATCH",
      cookie: cookie.owner,
      body: { inspectionInterval_days: 30 },
    });
    expect(interval.status).toBe(409);
    // The registry list still shows it, marked retired.
    const list = await http(`/api/apparatus?q=${encodeURIComponent("Old induction coil")}&owner=mine`, {
      cookie: cookie.owner,
    });
    expect(list.json?.rows.find((r: { id: string }) => r.id === id)?.retiredAt).toBeTruthy();
    const [row] = await getDb()
      .select({ state: applications.state })
      .from(applications)
      .where(eq(applications.id, app.id));
    expect(row.state).toBe("draft");
  });
});
