// Pre-use checks at the bench (issue 17, item 2) against the production build and the test database:
// recording a check, its idempotency key, the 422s that name the field, who may record one and when,
// photos through the upload checks, the "no" mail reaching the holder and the safety officers once,
// and the officers' list of tier 3–4 permits with no recent check.
import crypto from "node:crypto";
import { and, eq, inArray, notInArray, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, mailOutbox, preUseChecks, users } from "@/db/schema";
import { currentUserColumns } from "@/lib/auth/current-user";
import { permitsDueACheck } from "@/lib/checks/queries";
import { deliverDueMail } from "@/lib/mail/actions";
import { createDepartment, createUser, ownerDb, requireDatabase } from "../support/db";
import { http, signIn } from "../support/http";
import { caughtTo } from "../jobs/support";
import { createPermitFixture, isoDayFromToday, type PermitFixture } from "../pdf/support";
import { checkBody, checklistOf } from "./support";

requireDatabase();

// The smallest valid PNG (1 × 1 px) and a PDF header: one photo, one file that is not a photo.
const PNG_1PX = Buffer.from(
  "iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==",
  "base64",
);
const PDF = Buffer.from("%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n", "latin1");

async function emailOf(id: string): Promise<string> {
  const [row] = await getDb().select({ email: users.email }).from(users).where(eq(users.id, id));
  return row.email;
}

async function checksOf(permitId: string) {
  return getDb().select().from(preUseChecks).where(eq(preUseChecks.permitId, permitId));
}

function post(f: PermitFixture, cookie: string, body: unknown) {
  return http(`/api/permits/${f.permit.id}/checks`, { method: "POST", cookie, body });
}

async function uploadPhoto(permitId: string, cookie: string, bytes: Buffer, type: string, name: string) {
  const form = new FormData();
  form.set("file", new Blob([new Uint8Array(bytes)], { type }), name);
  const res = await fetch(`${process.env.TEST_BASE_URL}/api/permits/${permitId}/checks/photos`, {
    method: "POST",
    headers: { cookie, origin: process.env.TEST_BASE_URL! },
    body: form,
  });
  return { status: res.status, json: (await res.json()) as Record<string, any> };
}

describe("the pre-use checklist", () => {
  it("asks a tier 3 permit for the second trained person, the barrier at the limited approach distance and the hook inspection, and each condition as written", async () => {
    const f = await createPermitFixture({ tier: 3, conditions: ["Doors to the corridor kept shut."] });
    const items = checklistOf(f);
    const texts = items.map((i) => i.text);
    // Benchclear's design, default rules table: tier 3 adds "second trained person present; barrier
    // at the limited approach distance" to tier 2 (common practice, product design).
    expect(texts).toContain("Second trained person present");
    expect(texts.some((t) => t.startsWith("Barrier in place at the limited approach distance"))).toBe(true);
    expect(texts).toContain("Grounding hook inspected: lead, clamp and insulation intact");
    expect(texts).toContain("Bleeder or automatic shorting tested today");
    expect(items.at(-1)).toEqual({ id: "condition:1", text: "Doors to the corridor kept shut.", group: "condition" });
    // Tier 4 only (product design: "interlocked enclosure or remote operation").
    expect(texts).not.toContain("Enclosure interlock tested, or firing is remote");
  });
});

describe("POST /api/permits/[id]/checks", () => {
  it("records the holder's check once (201), and answers a retry with the same key with that check (200)", async () => {
    const f = await createPermitFixture({ tier: 3 });
    const cookie = await signIn(await emailOf(f.holder.id));
    const body = checkBody(f);
    const first = await post(f, cookie, body);
    expect(first.status).toBe(201);
    expect(first.json?.check.anyNo).toBe(false);
    const again = await post(f, cookie, body);
    expect(again.status).toBe(200);
    expect(again.json?.check).toMatchObject({ id: first.json?.check.id, replayed: true });
    const rows = await checksOf(f.permit.id);
    expect(rows).toHaveLength(1);
    expect(rows[0].items).toHaveLength(checklistOf(f).length);
    expect(rows[0].recordedById).toBe(f.holder.id);
    const audit = await getDb()
      .select({ action: auditEvents.action })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, f.permit.id), eq(auditEvents.action, "permit.pre_use_check_recorded")));
    expect(audit).toHaveLength(1);
  });

  it("lets a named operator and a safety officer record one; refuses the department's reviewer (403)", async () => {
    const f = await createPermitFixture({ tier: 2 });
    expect((await post(f, await signIn(await emailOf(f.operator.id)), checkBody(f))).status).toBe(201);
    expect((await post(f, await signIn(await emailOf(f.officer.id)), checkBody(f))).status).toBe(201);
    const reviewer = await post(f, await signIn(await emailOf(f.reviewer.id)), checkBody(f));
    expect(reviewer.status).toBe(403);
    expect(await checksOf(f.permit.id)).toHaveLength(2);
  });

  it("answers 422 naming the field: an unanswered item, an item not on the checklist, a missing item", async () => {
    const f = await createPermitFixture({ tier: 3 });
    const cookie = await signIn(await emailOf(f.holder.id));
    const unanswered = checkBody(f) as unknown as { items: { answer: string }[] };
    unanswered.items[2].answer = "";
    const a = await post(f, cookie, unanswered);
    expect(a.status).toBe(422);
    expect(a.json?.error.issues).toContainEqual({
      path: "items[2].answer",
      message: "Answer yes, no or not applicable.",
    });

    const foreign = checkBody(f);
    foreign.items[1] = { ...foreign.items[1], id: "control:not-on-this-permit" };
    const b = await post(f, cookie, foreign);
    expect(b.status).toBe(422);
    expect(b.json?.error.issues[0].path).toBe("items[1].id");

    const short = checkBody(f);
    short.items.pop();
    const c = await post(f, cookie, short);
    expect(c.status).toBe(422);
    expect(c.json?.error.issues[0].path).toBe("items");

    const badKey = { ...checkBody(f), idempotencyKey: "again" };
    const d = await post(f, cookie, badKey);
    expect(d.status).toBe(422);
    expect(d.json?.error.issues[0].path).toBe("idempotencyKey");
    expect(await checksOf(f.permit.id)).toHaveLength(0);
  });

  it("is refused (409) on a revoked permit, an expired one, and one not valid yet", async () => {
    for (const options of [
      { state: "revoked" as const },
      { state: "expired" as const },
      { validFrom: isoDayFromToday(3), validTo: isoDayFromToday(20) },
    ]) {
      const f = await createPermitFixture({ tier: 3, ...options });
      const res = await post(f, await signIn(await emailOf(f.holder.id)), checkBody(f));
      expect(res.status, JSON.stringify(options)).toBe(409);
      expect(await checksOf(f.permit.id)).toHaveLength(0);
    }
  });

  it("takes a photo through the upload checks, refuses a PDF (422 naming the file), and a photo of another permit", async () => {
    const f = await createPermitFixture({ tier: 3 });
    const other = await createPermitFixture({ tier: 3, holder: f.holder, departmentId: f.departmentId });
    const cookie = await signIn(await emailOf(f.holder.id));
    const photo = await uploadPhoto(f.permit.id, cookie, PNG_1PX, "image/png", "hook.png");
    expect(photo.status).toBe(201);
    const pdf = await uploadPhoto(f.permit.id, cookie, PDF, "image/png", "renamed.png");
    expect(pdf.status).toBe(422);
    expect(pdf.json.error.issues[0].path).toBe("file");
    const elsewhere = await uploadPhoto(other.permit.id, cookie, PNG_1PX, "image/png", "x.png");

    const hook = checklistOf(f).find((i) => i.id === "control:hook-inspected")!.id;
    const wrong = await post(f, cookie, checkBody(f, { [hook]: { answer: "yes", photoId: elsewhere.json.photo.id } }));
    expect(wrong.status).toBe(422);
    expect(wrong.json?.error.issues[0].path).toMatch(/^items\[\d+\]\.photoId$/);

    const ok = await post(f, cookie, checkBody(f, { [hook]: { answer: "yes", photoId: photo.json.photo.id } }));
    expect(ok.status).toBe(201);
    const served = await http(`/api/permits/${f.permit.id}/checks/photos/${photo.json.photo.id}`, { cookie });
    expect(served.status).toBe(200);
    expect(served.headers.get("content-type")).toBe("image/png");
    expect(served.headers.get("x-content-type-options")).toBe("nosniff");
  });

  it("a pre-use check with a 'no' reaching both inboxes exactly once", async () => {
    const f = await createPermitFixture({ tier: 3 });
    const [holderEmail, officerEmail] = await Promise.all([emailOf(f.holder.id), emailOf(f.officer.id)]);
    const cookie = await signIn(await emailOf(f.operator.id));
    const barrier = checklistOf(f).find((i) => i.id === "control:barrier-at-limited-approach")!;
    const body = checkBody(f, { [barrier.id]: { answer: "no", note: "Barrier stand missing one foot." } });
    const first = await post(f, cookie, body);
    expect(first.status).toBe(201);
    expect(first.json?.check.anyNo).toBe(true);
    // The phone lost the answer and sends the same check again: no second check, no second mail.
    expect((await post(f, cookie, body)).status).toBe(200);

    const checkId = first.json?.check.id as string;
    const rows = await getDb()
      .select({ id: mailOutbox.id, to: mailOutbox.toAddress })
      .from(mailOutbox)
      .where(sql`${mailOutbox.kind} = 'pre_use_check_failed' AND ${mailOutbox.data} ->> 'checkId' = ${checkId}`);
    const ours = rows.filter((r) => [holderEmail, officerEmail].includes(r.to));
    expect(ours.map((r) => r.to).sort()).toEqual([holderEmail, officerEmail].sort());
    // Every other safety officer in the shared test database got a row too; take those out so this
    // test sends nothing to other tests' officers.
    await ownerDb()
      .delete(mailOutbox)
      .where(
        and(
          inArray(
            mailOutbox.id,
            rows.map((r) => r.id),
          ),
          notInArray(mailOutbox.toAddress, [holderEmail, officerEmail]),
        ),
      );
    await deliverDueMail({ ids: ours.map((r) => r.id) });
    await deliverDueMail({ ids: ours.map((r) => r.id) });
    for (const address of [holderEmail, officerEmail]) {
      const caught = caughtTo(address).filter((m) => m.headers["x-benchclear-kind"] === "pre_use_check_failed");
      expect(caught, address).toHaveLength(1);
      expect(caught[0].subject).toBe(`Pre-use check failed: permit ${f.permit.number}`);
      expect(caught[0].text).toContain("Barrier stand missing one foot.");
      expect(caught[0].text).toContain(`/permits/${f.permit.id}`);
    }
  });
});

describe("the officers' list of permits with no recent check", () => {
  it("lists a tier 3 permit in use with no check in 7 days, not a tier 2 one, and drops it once checked", async () => {
    const dept = await createDepartment();
    const holder = await createUser({ roles: ["instructor"], departmentId: dept.id });
    const [three, two, stale] = await Promise.all([
      createPermitFixture({ tier: 3, holder, departmentId: dept.id }),
      createPermitFixture({ tier: 2, holder, departmentId: dept.id }),
      createPermitFixture({ tier: 4, holder, departmentId: dept.id }),
    ]);
    // A check 8 days ago (7 × 24 h is the window) is not recent.
    await ownerDb()
      .insert(preUseChecks)
      .values({
        permitId: stale.permit.id,
        recordedById: holder.id,
        recordedByName: holder.name,
        idempotencyKey: crypto.randomUUID(),
        items: [],
        anyNo: false,
        checkedAt: new Date(Date.now() - 8 * 86_400_000),
      });
    const [officerRow] = await getDb().select(currentUserColumns).from(users).where(eq(users.id, three.officer.id));
    const due = async () => (await permitsDueACheck(officerRow, new Date(), 10_000)).map((r) => r.id);
    let ids = await due();
    expect(ids).toContain(three.permit.id);
    expect(ids).toContain(stale.permit.id);
    expect(ids).not.toContain(two.permit.id);

    expect((await post(three, await signIn(holder.email), checkBody(three))).status).toBe(201);
    ids = await due();
    expect(ids).not.toContain(three.permit.id);
    expect(ids).toContain(stale.permit.id);
    // Instructors are not asked to follow these up.
    const [instructorRow] = await getDb().select(currentUserColumns).from(users).where(eq(users.id, holder.id));
    expect(await permitsDueACheck(instructorRow)).toEqual([]);
  });
});
