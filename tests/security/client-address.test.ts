// Issue 14: the client's address is the TCP peer unless a configured number of proxy hops is
// trusted; per-address and per-account sign-in limits; the throttle's check and record are one atomic
// step. X-Forwarded-For semantics: each proxy appends the address it received the request from, so
// the trustworthy entries are on the right (MDN, "X-Forwarded-For", security and privacy concerns;
// RFC 7239 §5.2 for the same rule in the Forwarded header).
import { spawn } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { addressBucket, clientIp, PEER_HEADER_ENV } from "@/lib/http/client-ip";
import { attempt, RULES } from "@/lib/ratelimit";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import { http, randomIp, signIn } from "../support/http";

requireDatabase();

function withPeerHeader<T>(fn: (name: string) => T): T {
  const saved = process.env[PEER_HEADER_ENV];
  process.env[PEER_HEADER_ENV] = "x-peer-under-test";
  try {
    return fn("x-peer-under-test");
  } finally {
    if (saved === undefined) delete process.env[PEER_HEADER_ENV];
    else process.env[PEER_HEADER_ENV] = saved;
  }
}

describe("clientIp", () => {
  it("with no trusted hop, the socket address is the client whatever X-Forwarded-For says", () =>
    withPeerHeader((name) => {
      // The preload writes: the X-Forwarded-For chain as received, then the socket's address.
      const headers = new Headers({ [name]: "198.51.100.7, 203.0.113.9", "x-forwarded-for": "198.51.100.7" });
      expect(clientIp(headers, 0)).toBe("203.0.113.9");
    }));

  it("with N trusted hops, the entry N places left of the socket; a longer forged prefix changes nothing", () =>
    withPeerHeader((name) => {
      // Client 192.0.2.10 → proxy A (appends 192.0.2.10) → proxy B 10.0.0.2 (appends A's 10.0.0.1) → us.
      const honest = new Headers({ [name]: "192.0.2.10, 10.0.0.1, 10.0.0.2" });
      expect(clientIp(honest, 2)).toBe("192.0.2.10");
      expect(clientIp(honest, 1)).toBe("10.0.0.1");
      const forged = new Headers({ [name]: "1.2.3.4, 5.6.7.8, 192.0.2.10, 10.0.0.1, 10.0.0.2" });
      expect(clientIp(forged, 2)).toBe("192.0.2.10");
      // More hops trusted than the chain has: the left-most entry, never something invented.
      expect(clientIp(new Headers({ [name]: "10.0.0.2" }), 3)).toBe("10.0.0.2");
    }));

  it("normalises IPv4-mapped IPv6 and refuses what is not an address", () =>
    withPeerHeader((name) => {
      expect(clientIp(new Headers({ [name]: "::ffff:192.0.2.1" }), 0)).toBe("192.0.2.1");
      expect(clientIp(new Headers({ [name]: "not-an-address, 192.0.2.1" }), 1)).toBe("unknown");
      expect(clientIp(new Headers({}), 0)).toBe("unknown");
    }));

  it("counts IPv6 clients per /64 (RFC 6177: a site or device is given a whole /64)", () => {
    expect(addressBucket("2001:db8:1:2:aaaa::1")).toBe(addressBucket("2001:db8:1:2:bbbb:cccc:dddd:eeee"));
    expect(addressBucket("2001:db8:1:2::1")).not.toBe(addressBucket("2001:db8:1:3::1"));
    expect(addressBucket("192.0.2.1")).toBe("192.0.2.1");
  });

  it("the preload records the real socket address, and a client's own header name cannot spoof it", async () => {
    // A tiny server in its own node process with scripts/lib/peer-address.mjs preloaded, as the web
    // server is started; it answers with the peer header it saw.
    const preload = path.resolve("scripts/lib/peer-address.mjs");
    const script = `
      const http = require("node:http");
      const s = http.createServer((req, res) => res.end(JSON.stringify({
        name: process.env.BENCHCLEAR_PEER_HEADER, value: req.headers[process.env.BENCHCLEAR_PEER_HEADER] })));
      s.listen(0, "127.0.0.1", () => console.log(s.address().port));`;
    const child = spawn(process.execPath, ["--import", preload, "-e", script], {
      stdio: ["ignore", "pipe", "inherit"],
    });
    try {
      const port = await new Promise<number>((resolve) => child.stdout.once("data", (d) => resolve(Number(String(d)))));
      const ask = async (headers: Record<string, string>) =>
        (await (await fetch(`http://127.0.0.1:${port}/`, { headers })).json()) as { name: string; value: string };
      const plain = await ask({});
      expect(plain.name).toMatch(/^x-benchclear-peer-[0-9a-f]{24}$/);
      expect(plain.value).toBe("127.0.0.1");
      const spoof = await ask({ "x-forwarded-for": "198.51.100.1", [plain.name]: "198.51.100.2" });
      expect(spoof.value).toBe("198.51.100.1, 127.0.0.1");
      withPeerHeader(() => {
        process.env[PEER_HEADER_ENV] = plain.name;
        expect(clientIp(new Headers({ [plain.name]: spoof.value }), 0)).toBe("127.0.0.1");
      });
    } finally {
      child.kill();
    }
  });
});

describe("sign-in throttling over HTTP", () => {
  it(`40 parallel wrong passwords for one e-mail: at most ${RULES.signInAccount.limit} are checked (401), the rest 429`, async () => {
    const user = await createUser({ roles: ["instructor"] });
    const answers = await Promise.all(
      Array.from({ length: 40 }, (_, i) =>
        http("/api/session", { method: "POST", body: { email: user.email, password: `parallel guess ${i}` } }),
      ),
    );
    const statuses = answers.map((a) => a.status);
    const wrong = statuses.filter((s) => s === 401).length;
    const limited = statuses.filter((s) => s === 429).length;
    expect(wrong).toBeLessThanOrEqual(RULES.signInAccount.limit);
    expect(wrong + limited).toBe(40);
    for (const a of answers.filter((x) => x.status === 429))
      expect(Number(a.headers.get("retry-after"))).toBeGreaterThan(0);
  });

  it("one person spraying from a campus address cannot lock out people who signed in there before", async () => {
    const campus = randomIp();
    const regular = await createUser({ roles: ["instructor"] });
    // A regular signs in from the campus network once: the browser is now known for that account.
    const known = await http("/api/session", {
      method: "POST",
      body: { email: regular.email, password: TEST_PASSWORD },
      headers: { "x-forwarded-for": campus },
    });
    expect(known.status).toBe(200);
    const deviceCookie = known.headers
      .getSetCookie()
      .map((c) => c.split(";")[0])
      .filter((c) => c.startsWith("benchclear-known-device="))
      .join("; ");
    expect(deviceCookie).not.toBe("");

    // Someone on the same NAT address sprays wrong passwords at many accounts until the address is
    // refused (most counted straight into the limiter, the last over HTTP).
    for (let i = 0; i < RULES.signInAddress.limit; i++) await attempt("signInAddress", addressBucket(campus));
    const sprayed = await http("/api/session", {
      method: "POST",
      body: { email: `spray-${Date.now()}@example.test`, password: "Summer2026!!" },
      headers: { "x-forwarded-for": campus },
    });
    expect(sprayed.status).toBe(429);

    // A first sign-in from a new browser on that address waits…
    const newcomer = await createUser({ roles: ["instructor"] });
    const waits = await http("/api/session", {
      method: "POST",
      body: { email: newcomer.email, password: TEST_PASSWORD },
      headers: { "x-forwarded-for": campus },
    });
    expect(waits.status).toBe(429);
    // …but the regular's known browser still signs in, from the same address,
    const again = await http("/api/session", {
      method: "POST",
      body: { email: regular.email, password: TEST_PASSWORD },
      cookie: deviceCookie,
      headers: { "x-forwarded-for": campus },
    });
    expect(again.status).toBe(200);
    // and the newcomer signs in from any other network.
    expect(await signIn(newcomer.email)).toContain("authjs.session-token");
  });
});
