import crypto from "node:crypto";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, permits } from "@/db/schema";
import { getPermitPdf } from "@/lib/pdf";
import { createDepartment, createUser, requireDatabase } from "../support/db";
import { baseUrl, randomIp, signIn } from "../support/http";
import {
  createPermitFixture,
  decodeQr,
  decodeQrs,
  pdfInfo,
  pdfText,
  revokeFixture,
  type PermitFixture,
} from "./support";

requireDatabase();

// GET /permits/[id]/pdf and /permits/[id]/bench-card against the production build: who may download,
// what the file is, and that the stored file follows the permit's state (rendered once while active,
// again on revocation or expiry, with the overprint).

async function download(path: string, cookie?: string) {
  const res = await fetch(baseUrl() + path, {
    headers: { ...(cookie ? { cookie } : {}), "x-forwarded-for": randomIp() },
    redirect: "manual",
  });
  const bytes = Buffer.from(await res.arrayBuffer());
  return {
    status: res.status,
    headers: res.headers,
    bytes,
    text: res.headers.get("content-type")?.includes("json") ? bytes.toString() : "",
  };
}

async function permitRow(id: string) {
  const [row] = await getDb()
    .select({ pdfKey: permits.pdfKey, pdfRenderedState: permits.pdfRenderedState, version: permits.version })
    .from(permits)
    .where(eq(permits.id, id));
  return row;
}

async function renderAudits(id: string) {
  return getDb()
    .select({ data: auditEvents.data, actorName: auditEvents.actorName })
    .from(auditEvents)
    .where(and(eq(auditEvents.entityId, id), eq(auditEvents.action, "permit.pdf_rendered")));
}

describe("GET /permits/[id]/pdf", () => {
  let fixture: PermitFixture;
  let holderCookie: string;

  beforeAll(async () => {
    fixture = await createPermitFixture({ tier: 3 });
    holderCookie = await signIn((await getUserEmail(fixture.holder.id))!);
  });

  it("serves the holder the A4 permit named after its number, with the figures and a QR code to its live page", async () => {
    const res = await download(`/permits/${fixture.permit.id}/pdf`, holderCookie);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(res.headers.get("content-disposition")).toBe(`attachment; filename="${fixture.permit.number}.pdf"`);
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    expect(res.headers.get("cache-control")).toContain("no-store");
    const info = pdfInfo(res.bytes);
    // ISO 216 A4: 210 × 297 mm = 595.28 × 841.89 pt.
    expect(info.width).toBeCloseTo(595.28, 1);
    const text = pdfText(res.bytes);
    expect(text).toContain(fixture.permit.number);
    expect(text).toContain("ACTIVE");
    // tests/pdf/samples.ts tier 3: ½·1 µF·(10 kV)² = 50.0 J at 10.0 kV.
    expect(text).toContain("50.0 J");
    expect(text).toContain("10.0 kV");
    expect(text).toContain(fixture.reviewer.name);
    expect(text).toContain(fixture.officer.name);
    expect(text).toContain("+44 20 7946 0100");
    // APP_URL of the test build is TEST_BASE_URL (scripts/test.mjs).
    expect(decodeQr(res.bytes)).toBe(`${baseUrl()}/verify/${fixture.permit.verificationCode}`);
  });

  it("stores the rendering once and serves the stored file until the state changes", async () => {
    const first = await permitRow(fixture.permit.id);
    expect(first.pdfKey).toMatch(/^permits\/[0-9a-f]{64}\/permit-a4\.pdf$/);
    expect(first.pdfRenderedState).toBe("active");
    const again = await download(`/permits/${fixture.permit.id}/pdf`, holderCookie);
    expect(again.status).toBe(200);
    expect((await permitRow(fixture.permit.id)).pdfKey).toBe(first.pdfKey);
    // One rendering, audited once, by the system, without bumping the permit's version.
    expect(await renderAudits(fixture.permit.id)).toHaveLength(1);
    expect((await permitRow(fixture.permit.id)).version).toBe(fixture.permit.version);
  });

  it("serves US Letter with ?size=letter and refuses any other size with 422 naming the field", async () => {
    const letter = await download(`/permits/${fixture.permit.id}/pdf?size=letter`, holderCookie);
    expect(letter.status).toBe(200);
    // US Letter: 8.5 × 11 in at 72 pt per inch.
    expect(pdfInfo(letter.bytes)).toMatchObject({ width: 612, height: 792 });
    const bad = await download(`/permits/${fixture.permit.id}/pdf?size=a3`, holderCookie);
    expect(bad.status).toBe(422);
    expect(JSON.parse(bad.text).error.issues[0].path).toBe("size");
    const extra = await download(`/permits/${fixture.permit.id}/pdf?size=a4&colour=red`, holderCookie);
    expect(extra.status).toBe(422);
  });

  it("renders again with a REVOKED overprint once the permit is revoked", async () => {
    const before = await permitRow(fixture.permit.id);
    await revokeFixture(fixture, "The interlock was found bypassed.");
    const res = await download(`/permits/${fixture.permit.id}/pdf`, holderCookie);
    expect(res.status).toBe(200);
    const text = pdfText(res.bytes);
    expect(text).toContain("REVOKED");
    expect(text).toContain("The interlock was found bypassed.");
    expect(text).not.toContain("ACTIVE");
    const after = await permitRow(fixture.permit.id);
    expect(after.pdfRenderedState).toBe("revoked");
    expect(after.pdfKey).not.toBe(before.pdfKey);
    expect(await renderAudits(fixture.permit.id)).toHaveLength(2);
  });

  it("shows a permit whose last day has passed as EXPIRED without anyone changing it", async () => {
    const expired = await createPermitFixture({ tier: 1, state: "expired" });
    const cookie = await signIn((await getUserEmail(expired.holder.id))!);
    const res = await download(`/permits/${expired.permit.id}/pdf`, cookie);
    const text = pdfText(res.bytes);
    expect(text).toContain("EXPIRED");
    expect(text).not.toContain("ACTIVE");
    expect((await permitRow(expired.permit.id)).pdfRenderedState).toBe("expired");
  });

  it("gives the approval e-mail the same stored A4 file through getPermitPdf", async () => {
    const other = await createPermitFixture({ tier: 2 });
    const file = await getPermitPdf(other.permit.id);
    expect(file.filename).toBe(`${other.permit.number}.pdf`);
    expect(pdfText(file.bytes)).toContain(other.permit.number);
    const row = await permitRow(other.permit.id);
    expect(row.pdfRenderedState).toBe("active");
    const cookie = await signIn((await getUserEmail(other.holder.id))!);
    const served = await download(`/permits/${other.permit.id}/pdf`, cookie);
    expect(served.bytes.equals(file.bytes)).toBe(true);
  });
});

describe("who may download a permit", () => {
  let fixture: PermitFixture;
  beforeAll(async () => {
    fixture = await createPermitFixture({ tier: 2 });
  });

  const cases: Array<[string, () => Promise<string | undefined>, number]> = [
    ["an operator named on the application", async () => getUserEmail(fixture.operator.id), 200],
    ["a reviewer of its department", async () => getUserEmail(fixture.reviewer.id), 200],
    ["a safety officer of any department", async () => (await createUser({ roles: ["safety_officer"] })).email, 200],
    [
      "another instructor of the same department",
      async () => (await createUser({ roles: ["instructor"], departmentId: fixture.departmentId })).email,
      404,
    ],
    [
      "a reviewer of another department",
      async () => (await createUser({ roles: ["reviewer"], departmentId: (await createDepartment()).id })).email,
      404,
    ],
    ["an admin", async () => (await createUser({ roles: ["admin"], departmentId: fixture.departmentId })).email, 404],
  ];
  for (const [who, email, status] of cases) {
    it(`answers ${status} to ${who}`, async () => {
      const cookie = await signIn((await email())!);
      const res = await download(`/permits/${fixture.permit.id}/pdf`, cookie);
      expect(res.status).toBe(status);
      if (status === 404) expect(res.headers.get("content-type")).toContain("application/json");
    });
  }

  it("answers 404 to an unknown or malformed permit id and sends a signed-out visitor to sign in", async () => {
    const cookie = await signIn((await getUserEmail(fixture.holder.id))!);
    expect((await download(`/permits/${crypto.randomUUID()}/pdf`, cookie)).status).toBe(404);
    expect((await download(`/permits/not-a-permit/pdf`, cookie)).status).toBe(404);
    const anonymous = await download(`/permits/${fixture.permit.id}/pdf`);
    expect(anonymous.status).toBe(307);
    expect(anonymous.headers.get("location")).toMatch(/\/sign-in/);
  });
});

describe("GET /permits/[id]/bench-card", () => {
  it("serves one page with the discharge steps, emergency contacts, state and the QR code", async () => {
    const fixture = await createPermitFixture({ tier: 4 });
    const cookie = await signIn((await getUserEmail(fixture.holder.id))!);
    for (const size of ["a4", "letter"] as const) {
      const res = await download(`/permits/${fixture.permit.id}/bench-card?size=${size}`, cookie);
      expect(res.status).toBe(200);
      expect(res.headers.get("content-disposition")).toBe(
        `attachment; filename="${fixture.permit.number}-bench-card.pdf"`,
      );
      expect(pdfInfo(res.bytes).pages).toBe(1);
      const text = pdfText(res.bytes);
      expect(text).toContain(fixture.permit.number);
      expect(text).toContain("ACTIVE");
      expect(text).toContain("Touch the grounding hook to Crusher bank");
      expect(text).toContain("Campus security (24 h)");
      // Two codes: the public status page and the signed-in pre-use check (issue 17).
      expect(decodeQrs(res.bytes, 2, 0.45).sort()).toEqual([
        `${baseUrl()}/permits/${fixture.permit.id}/check`,
        `${baseUrl()}/verify/${fixture.permit.verificationCode}`,
      ]);
    }
    const other = await signIn((await createUser({ roles: ["instructor"] })).email);
    expect((await download(`/permits/${fixture.permit.id}/bench-card`, other)).status).toBe(404);
  });
});

async function getUserEmail(id: string): Promise<string | undefined> {
  const { users } = await import("@/db/schema");
  const [row] = await getDb().select({ email: users.email }).from(users).where(eq(users.id, id));
  return row?.email;
}
