import crypto from "node:crypto";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { users } from "@/db/schema";
import { addressBucket } from "@/lib/http/client-ip";
import { attempt } from "@/lib/ratelimit";
import { VERIFY_RATE_LIMIT } from "@/lib/verify";
import { requireDatabase } from "../support/db";
import { http, randomIp } from "../support/http";
import { createPermitFixture, revokeFixture, type PermitFixture } from "../pdf/support";

requireDatabase();

// /verify/[code], the public page behind a permit's QR code, against the production build: the live
// status in words, only what the printed permit shows, the same answer for unknown and malformed
// codes, no caching, and the per-address rate limit.

/** The page's <main> with tags stripped and white space folded: what a reader sees. */
function mainText(html: string): string {
  const main = /<main\b[^>]*>([\s\S]*?)<\/main>/.exec(html)?.[1] ?? "";
  return main
    .replace(/<!-- -->/g, "")
    .replace(/<[^>]+>/g, " ")
    .replace(/&#x27;|&#39;/g, "'")
    .replace(/&amp;/g, "&")
    .replace(/\s+/g, " ")
    .trim();
}

function mainHtml(html: string): string {
  return /<main\b[^>]*>([\s\S]*?)<\/main>/.exec(html)?.[1] ?? "";
}

async function verify(code: string, ip = randomIp()) {
  const res = await http(`/verify/${code}`, { headers: { "x-forwarded-for": ip } });
  return { ...res, main: mainText(res.text) };
}

/** 12 Mar 2026 style, as the page prints ISO days. */
function day(iso: string): string {
  const [y, m, d] = iso.split("-").map(Number);
  return `${d} ${["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"][m - 1]} ${y}`;
}

describe("GET /verify/[code]", () => {
  let active: PermitFixture;
  let holderEmail: string;

  beforeAll(async () => {
    active = await createPermitFixture({ tier: 3 });
    const [row] = await getDb().select({ email: users.email }).from(users).where(eq(users.id, active.holder.id));
    holderEmail = row.email;
  });

  it("shows an active permit's status, number, holder, apparatus, room, event days, audience, validity, tier and signers, and nothing more", async () => {
    const res = await verify(active.permit.verificationCode);
    expect(res.status).toBe(200);
    const text = res.main;
    expect(text).toContain("Permit status Active");
    expect(text).toContain("in force");
    expect(text).toContain(active.permit.number);
    expect(text).toContain(active.holder.name);
    expect(text).toContain(active.content.event.room);
    expect(text).toContain(`${day(active.permit.validFrom)} – ${day(active.permit.validTo)}`);
    expect(text).toContain("Tier 3 · Lethal shock");
    expect(text).toContain(`${active.reviewer.name} Reviewed and recommended for approval`);
    expect(text).toContain(`${active.officer.name} Approved for use as described`);
    // issue 20: the apparatus, the event days and the audience, as the printed permit shows them.
    expect(text).toContain(`Apparatus ${active.content.apparatus.name}`);
    expect(text).toContain(`Event days ${day(active.content.event.firstDay)}`);
    expect(text).toContain(
      `Audience ${active.content.event.audienceSize} ${active.content.event.audience === "public" ? "members of the public" : "students"}`,
    );
    // Nothing beyond the printed permit's public facts (security.md): no e-mail, figures,
    // conditions, operators or signer roles.
    for (const hidden of [
      holderEmail,
      active.operator.name,
      "50.0 J",
      active.permit.conditions[0],
      "Safety officer",
      active.content.event.title,
    ]) {
      expect(res.text, hidden).not.toContain(hidden);
    }
  });

  it("is never cached or indexed", async () => {
    const res = await verify(active.permit.verificationCode);
    expect(res.headers.get("cache-control")).toMatch(/no-store/);
    expect(res.text).toMatch(/<meta name="robots" content="noindex, nofollow, nocache"/);
  });

  it("gives every answer its own CSP nonce, the one its scripts carry, and the same page otherwise", async () => {
    // proxy.ts answers a repeated look-up of the same content with the HTML already rendered for it
    // (lib/verify/rendered.ts); a nonce reused across answers would let a script injected into one
    // page run with another's. Source: CSP Level 3 §6.7.2 (W3C), a nonce is unique per response.
    const code = active.permit.verificationCode;
    const [a, b] = [await verify(code), await verify(code)];
    const nonceOf = (res: typeof a) => /'nonce-([^']+)'/.exec(res.headers.get("content-security-policy") ?? "")?.[1];
    const [na, nb] = [nonceOf(a), nonceOf(b)];
    expect(na).toBeTruthy();
    expect(nb).toBeTruthy();
    expect(na).not.toBe(nb);
    for (const [res, nonce, other] of [
      [a, na!, nb!],
      [b, nb!, na!],
    ] as const) {
      const scripts = res.text.match(/<script\b[^>]*>/g) ?? [];
      expect(scripts.length).toBeGreaterThan(0);
      for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`);
      expect(res.text).not.toContain(other);
    }
    expect(a.text.split(na!).join("N")).toBe(b.text.split(nb!).join("N"));
  });

  it("never shows content a client sends along with its look-up", async () => {
    // The page takes the permit proxy.ts read from a request header only with this process's random
    // token; a client's own header is removed before the page sees it.
    const forged = Buffer.from(
      JSON.stringify({ kind: "found", permit: { number: "HV-FORGED-0001", status: "active", signers: [] } }),
    ).toString("base64url");
    const res = await http(`/verify/${crypto.randomBytes(32).toString("base64url")}`, {
      headers: {
        "x-forwarded-for": randomIp(),
        "x-benchclear-verify-counted": "1",
        "x-benchclear-verify-outcome": forged,
      },
    });
    expect(res.status).toBe(200);
    expect(mainText(res.text)).toContain("Permit status Unknown");
    expect(res.text).not.toContain("HV-FORGED-0001");
  });

  it("shows a revocation on the very next request", async () => {
    const fixture = await createPermitFixture({ tier: 2 });
    expect((await verify(fixture.permit.verificationCode)).main).toContain("Permit status Active");
    await revokeFixture(fixture);
    const after = await verify(fixture.permit.verificationCode);
    expect(after.main).toContain("Permit status Revoked");
    expect(after.main).toContain("Do not run this set-up");
    expect(after.main).toContain(`Revoked on ${day(new Date().toISOString().slice(0, 10))}`);
    expect(after.main).toContain(`${fixture.officer.name} Revoked: the permit no longer holds`);
    expect(after.main).not.toContain("The interlock was found bypassed.");
  });

  it("shows a revoked permit as revoked", async () => {
    const fixture = await createPermitFixture({ tier: 4, state: "revoked" });
    const res = await verify(fixture.permit.verificationCode);
    expect(res.main).toContain("Permit status Revoked");
    expect(res.main).toContain(fixture.permit.number);
    expect(res.main).toContain("Tier 4 · Arc and blast");
  });

  it("shows a permit past its last day as expired", async () => {
    const fixture = await createPermitFixture({ tier: 1, state: "expired" });
    const res = await verify(fixture.permit.verificationCode);
    expect(res.main).toContain("Permit status Expired");
    expect(res.main).toContain("last valid day has passed");
    expect(res.main).toContain(fixture.permit.number);
  });

  it("says when a permit that is in force starts later", async () => {
    const fixture = await createPermitFixture({
      tier: 0,
      validFrom: new Date(Date.now() + 3 * 86_400_000).toISOString().slice(0, 10),
      validTo: new Date(Date.now() + 9 * 86_400_000).toISOString().slice(0, 10),
    });
    const res = await verify(fixture.permit.verificationCode);
    expect(res.main).toContain("Permit status Active");
    expect(res.main).toContain(`It starts on ${day(fixture.permit.validFrom)}: not before.`);
    expect(res.main).toContain("No review signatures");
  });

  it("answers unknown and malformed codes with the same status and the same page", async () => {
    const unknown = await verify(crypto.randomBytes(32).toString("base64url"));
    const malformed = [
      await verify("abc"),
      await verify("%3Cscript%3E"),
      await verify("x".repeat(300)),
      await verify(active.permit.verificationCode.slice(0, -1) + "!"),
    ];
    expect(unknown.status).toBe(200);
    expect(unknown.main).toContain("Permit status Unknown");
    expect(unknown.main).toContain("No permit matches this code");
    expect(unknown.main).not.toContain(active.permit.number);
    for (const res of malformed) {
      expect(res.status).toBe(unknown.status);
      expect(mainHtml(res.text)).toBe(mainHtml(unknown.text));
    }
  });

  it(`refuses look-ups past ${VERIFY_RATE_LIMIT.limit} per ${VERIFY_RATE_LIMIT.windowSeconds / 60} minutes from one address, whatever the code`, async () => {
    const ip = randomIp();
    const unknownCode = crypto.randomBytes(32).toString("base64url");
    // All but the last few look-ups counted straight into the limiter (fast), the rest over HTTP.
    for (let i = 0; i < VERIFY_RATE_LIMIT.limit - 4; i++) await attempt("statusPage", addressBucket(ip));
    for (let i = VERIFY_RATE_LIMIT.limit - 4; i < VERIFY_RATE_LIMIT.limit; i++) {
      const res = await verify(i % 2 ? unknownCode : active.permit.verificationCode, ip);
      expect(res.main, `look-up ${i + 1}`).not.toContain("Too many checks");
    }
    const refused = await verify(active.permit.verificationCode, ip);
    expect(refused.main).toContain("Too many checks");
    expect(refused.main).toMatch(/Wait about \d+ minutes? and scan the code again/);
    expect(refused.text).not.toContain(active.permit.number);
    expect(refused.text).not.toContain(active.holder.name);
    // The test server trusts one proxy hop, so the right-most X-Forwarded-For entry is the client
    // (lib/http/client-ip.ts): a spoofed left-hand entry does not reset the count, and another
    // address is still answered.
    const spoofed = await verify(active.permit.verificationCode, `${randomIp()}, ${ip}`);
    expect(spoofed.main).toContain("Too many checks");
    const other = await verify(active.permit.verificationCode, randomIp());
    expect(other.main).toContain("Permit status Active");
  });

  it("counts each look-up once, in front of the page, and a client cannot claim it was counted", async () => {
    // proxy.ts counts the look-up and tells the page with a per-process random token; a client that
    // sends the header itself (any value) is still counted, so the limit holds at exactly the limit.
    const ip = randomIp();
    for (let i = 0; i < VERIFY_RATE_LIMIT.limit; i++) {
      const res = await http(`/verify/${active.permit.verificationCode}`, {
        headers: { "x-forwarded-for": ip, "x-benchclear-verify-counted": "1" },
      });
      expect(mainText(res.text), `look-up ${i + 1}`).not.toContain("Too many checks");
    }
    const refused = await http(`/verify/${active.permit.verificationCode}`, {
      headers: { "x-forwarded-for": ip, "x-benchclear-verify-counted": "1" },
    });
    expect(refused.status).toBe(429);
    expect(refused.headers.get("retry-after")).toMatch(/^\d+$/);
  });
});
