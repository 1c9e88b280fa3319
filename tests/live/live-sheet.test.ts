import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { currentUserColumns } from "@/lib/auth/current-user";
import { users } from "@/db/schema";
import { eq } from "drizzle-orm";
import { liveSheet } from "@/lib/permits/live";
import { NO_BUILDING, splitPlace, walkOrder } from "@/lib/permits/places";
import { emergencyContactsSchema } from "@/lib/settings/schemas";
import { renderLiveSheet } from "@/lib/pdf/live-sheet";
import { CONTACTS, createPermitFixture, isoDayFromToday, pdfInfo, pdfText } from "../pdf/support";
import { createDepartment, createUser, requireDatabase, uniq } from "../support/db";
import { baseUrl, http, randomIp, signIn } from "../support/http";

requireDatabase();

// Issue 18, item 6: where high voltage is live today. The test makes its own permits in buildings
// named only here and checks the sheet against SQL written in this file, not against the code's query.

async function asCurrentUser(id: string) {
  const [row] = await getDb().select(currentUserColumns).from(users).where(eq(users.id, id));
  return row;
}

describe("splitting a place into building and room", () => {
  it("reads the part after the last comma as the building", () => {
    expect(splitPlace("Room 1.05, Faraday Building")).toEqual({ building: "Faraday Building", room: "Room 1.05" });
    expect(splitPlace("Bay 3, Cell 2, Annexe")).toEqual({ building: "Annexe", room: "Bay 3, Cell 2" });
    expect(splitPlace("B12 lecture theatre")).toEqual({ building: NO_BUILDING, room: "B12 lecture theatre" });
  });

  it("walks named buildings first, rooms by the number on the door (2 before 10), then unnamed ones", () => {
    // common practice: door numbers read as numbers, not as text ("Room 10" after "Room 9").
    const rows = [
      { building: NO_BUILDING, room: "Hall", number: "HV-1" },
      { building: "Maxwell Wing", room: "Room 10", number: "HV-2" },
      { building: "maxwell wing", room: "Room 2", number: "HV-3" },
      { building: "Faraday Building", room: "Lab 7", number: "HV-4" },
    ];
    expect([...rows].sort(walkOrder).map((r) => r.number)).toEqual(["HV-4", "HV-3", "HV-2", "HV-1"]);
  });
});

describe("the emergency phone setting", () => {
  it("accepts short emergency numbers and international numbers, and refuses what cannot be dialled", () => {
    // ITU-T E.164 §6: at most 15 digits in an international number; 112 and 999 are three-digit
    // emergency numbers (memory).
    const ok = (phone: string) =>
      emergencyContactsSchema.safeParse({ contacts: [{ label: "Security", phone }] }).success;
    expect(ok("112")).toBe(true);
    expect(ok("+44 20 7946 0100")).toBe(true);
    expect(ok("(020) 7946-0142")).toBe(true);
    expect(ok("12")).toBe(false);
    expect(ok("+1234567890123456")).toBe(false); // 16 digits
    expect(ok("call the porter")).toBe(false);
    expect(ok("=HYPERLINK(1)")).toBe(false);
    expect(emergencyContactsSchema.safeParse({ contacts: [] }).success).toBe(false);
  });
});

describe("the live sheet", () => {
  const u = uniq("live");
  const fixtures: Record<string, Awaited<ReturnType<typeof createPermitFixture>>> = {};
  let officerCookie = "";
  let responderCookie = "";
  let officerId = "";

  beforeAll(async () => {
    const dept = await createDepartment();
    const make = (key: string, options: Parameters<typeof createPermitFixture>[0]) =>
      createPermitFixture({ departmentId: dept.id, ...options }).then((f) => (fixtures[key] = f));
    await make("beta10", { tier: 4, room: `Room 10, Beta Hall ${u}` });
    await make("beta2", { tier: 2, room: `Room 2, Beta Hall ${u}` });
    await make("alpha", { tier: 1, room: `Bench 4, Alpha House ${u}` });
    // Starts today and ends today: live (the window is inclusive at both ends).
    await make("today", {
      tier: 3,
      room: `Cell 1, Alpha House ${u}`,
      validFrom: isoDayFromToday(0),
      validTo: isoDayFromToday(0),
    });
    // Not live: starts tomorrow, ended yesterday, revoked.
    await make("future", {
      tier: 3,
      room: `Room 1, Alpha House ${u}`,
      validFrom: isoDayFromToday(1),
      validTo: isoDayFromToday(9),
    });
    await make("expired", { tier: 3, room: `Room 3, Alpha House ${u}`, state: "expired" });
    await make("revoked", { tier: 3, room: `Room 4, Alpha House ${u}`, state: "revoked" });
    const officer = await createUser({ roles: ["safety_officer"] });
    const responder = await createUser({ roles: ["responder"] });
    officerId = officer.id;
    officerCookie = await signIn(officer.email);
    responderCookie = await signIn(responder.email);
  });

  const mine = (numbers: string[]) => numbers.filter((n) => Object.values(fixtures).some((f) => f.permit.number === n));

  it("lists exactly the permits active today, the ones this SQL finds, in walking order", async () => {
    const sheet = await liveSheet(await asCurrentUser(officerId));
    // Independent of lib/permits/live.ts: active state, today inside the inclusive window (UTC days,
    // the fixtures' institution zone).
    const ids = Object.values(fixtures).map((f) => f.permit.id);
    const expected = await getDb().execute<{ number: string }>(sql`
      SELECT number FROM permit
      WHERE id IN (${sql.join(
        ids.map((id) => sql`${id}::uuid`),
        sql`, `,
      )})
        AND state = 'active' AND valid_from <= (now() AT TIME ZONE 'UTC')::date AND valid_to >= (now() AT TIME ZONE 'UTC')::date`);
    const listed = mine(sheet.rows.map((r) => r.number));
    expect(new Set(listed)).toEqual(new Set(expected.rows.map((r) => r.number)));
    // Alpha House before Beta Hall; in Alpha "Bench 4" before "Cell 1"; in Beta Room 2 before Room 10.
    expect(listed).toEqual([
      fixtures.alpha.permit.number,
      fixtures.today.permit.number,
      fixtures.beta2.permit.number,
      fixtures.beta10.permit.number,
    ]);
    const row = sheet.rows.find((r) => r.number === fixtures.beta10.permit.number)!;
    expect(row).toMatchObject({
      building: `Beta Hall ${u}`,
      room: "Room 10",
      tier: 4,
      holderName: fixtures.beta10.holder.name,
      emergencyPhone: CONTACTS[0].phone,
    });
  });

  it("serves the page and a one-page PDF to a responder, with tier, signal word, holder and phone", async () => {
    const page = await http("/live", { cookie: responderCookie });
    expect(page.status).toBe(200);
    expect(page.text).toContain(fixtures.beta10.permit.number);
    expect(page.text).toContain(`Beta Hall ${u}`);
    expect(page.text).not.toContain(fixtures.future.permit.number);

    const res = await fetch(`${baseUrl()}/live/pdf`, {
      headers: { cookie: responderCookie, "x-forwarded-for": randomIp() },
      redirect: "manual",
    });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    const pdf = Buffer.from(await res.arrayBuffer());
    expect(pdfInfo(pdf).pages).toBe(1);
    const text = pdfText(pdf);
    for (const f of [fixtures.alpha, fixtures.today, fixtures.beta2, fixtures.beta10])
      expect(text).toContain(f.permit.number);
    expect(text).not.toContain(fixtures.revoked.permit.number);
    // ANSI Z535.4 / ISO 3864-2: DANGER for tier 4, WARNING for tier 2, CAUTION for tier 1.
    expect(text).toMatch(
      new RegExp(`DANGER.*${fixtures.beta10.permit.number}|${fixtures.beta10.permit.number}.*DANGER`),
    );
    expect(text).toContain("WARNING");
    expect(text).toContain("CAUTION");
    expect(text).toContain(fixtures.beta10.holder.name);
    expect(text).toContain(CONTACTS[0].phone);
  });

  it("refuses the responder every other page, and sends its dashboard to the sheet", async () => {
    expect((await http("/", { cookie: responderCookie })).headers.get("location")).toMatch(/\/live$/);
    const permits = await http("/permits", { cookie: responderCookie });
    expect(permits.status).toBe(307);
    expect(permits.headers.get("location")).toMatch(/\/forbidden$/);
    expect((await http("/api/permits", { cookie: responderCookie })).status).toBe(403);
    expect(
      (await http(`/permits/${fixtures.beta10.permit.id}/pdf`, { cookie: responderCookie })).headers.get("location"),
    ).toMatch(/\/forbidden$/);
    // The officer sees the sheet too.
    expect((await http("/live", { cookie: officerCookie })).status).toBe(200);
  });

  it("lets an admin set the emergency contacts, refusing a bad phone by its field (422)", async () => {
    const admin = await createUser({ roles: ["admin"] });
    const cookie = await signIn(admin.email);
    const bad = await http("/api/admin/emergency-contacts", {
      method: "PUT",
      cookie,
      body: {
        contacts: [
          { label: "Security", phone: "+44 20 7946 0100" },
          { label: "Porter", phone: "ring twice" },
        ],
      },
    });
    expect(bad.status).toBe(422);
    expect(bad.json?.error.issues.map((i: { path: string }) => i.path)).toEqual(["contacts[1].phone"]);
    // The same contacts the fixtures print, so files running beside this one see no change.
    const ok = await http("/api/admin/emergency-contacts", { method: "PUT", cookie, body: { contacts: CONTACTS } });
    expect(ok.status).toBe(200);
    expect(ok.json?.contacts).toEqual(CONTACTS);
    const [audited] = (
      await getDb().execute<{ n: number }>(
        sql`SELECT count(*)::int AS n FROM audit_event WHERE action = 'settings.emergency_contacts_updated' AND actor_id = ${admin.id}`,
      )
    ).rows;
    expect(audited.n).toBe(1);
  });
  // Last: it renders in this process for a few seconds, and the HTTP tests above reuse sockets.
  it("keeps a long list on one page, saying how many set-ups it could not print", async () => {
    const sheet = await liveSheet(await asCurrentUser(officerId));
    const base = sheet.rows[0] ?? (await liveSheet(await asCurrentUser(officerId))).rows[0];
    const many = Array.from({ length: 140 }, (_, i) => ({ ...base, permitId: `p${i}`, number: `HV-2026-${9000 + i}` }));
    const pdf = await renderLiveSheet({ ...sheet, rows: many });
    expect(pdfInfo(pdf).pages).toBe(1);
    const text = pdfText(pdf);
    expect(text).toContain("HV-2026-9000");
    const notPrinted = /(\d+) more live set-ups are not printed/.exec(text);
    expect(notPrinted).not.toBeNull();
    const printed = many.filter((r) => text.includes(r.number)).length;
    expect(printed + Number(notPrinted![1])).toBe(140);
  });
});
