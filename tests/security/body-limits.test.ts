// Issue 14, unbounded bodies: every route reads its body through lib/http/body.ts, which counts bytes
// as they stream and stops at the route's limit with 413 — with or without Content-Length, chunked or
// not. The memory check reads the test server's resident set from /proc/<pid>/status (VmRSS, Linux
// proc(5)); scripts/test.mjs passes the server's pid as TEST_SERVER_PID (the server is node itself,
// started by scripts/lib/next-server.mjs, so the pid is the process that would hold the bytes).
import fs from "node:fs";
import http from "node:http";
import { describe, expect, it } from "vitest";
import { createDraft, instructorWithReviewer } from "../applications/support";
import { requireDatabase } from "../support/db";
import { baseUrl, http as call, randomIp } from "../support/http";

requireDatabase();

function residentBytes(): number {
  const pid = process.env.TEST_SERVER_PID;
  if (!pid) throw new Error("TEST_SERVER_PID is not set: run the tests with `npm test`.");
  const status = fs.readFileSync(`/proc/${pid}/status`, "utf8");
  const kib = /^VmRSS:\s+(\d+)\s+kB$/m.exec(status);
  if (!kib) throw new Error("no VmRSS line in /proc/<pid>/status");
  return Number(kib[1]) * 1024;
}

type Sent = { status: number; bytesSent: number; body: string };

/**
 * Sends `total` bytes chunked (no Content-Length) in 1 MiB writes, honouring back-pressure, and stops
 * writing as soon as the server answers. Resolves with the answer and how much was sent.
 */
function sendChunked(path: string, total: number, headers: Record<string, string>): Promise<Sent> {
  const url = new URL(path, baseUrl());
  const chunk = Buffer.alloc(1024 * 1024, 0x61); // one reused MiB of "a"
  return new Promise((resolve, reject) => {
    let bytesSent = 0;
    let answered = false;
    const req = http.request(
      url,
      { method: "POST", headers: { ...headers, "transfer-encoding": "chunked", origin: baseUrl() } },
      (res) => {
        answered = true;
        let body = "";
        res.setEncoding("utf8");
        res.on("data", (d) => (body += d));
        res.on("end", () => {
          resolve({ status: res.statusCode ?? 0, bytesSent, body });
          req.destroy();
        });
      },
    );
    req.on("error", (error) => {
      if (!answered) reject(error);
    });
    const pump = () => {
      while (!answered && bytesSent < total) {
        bytesSent += chunk.length;
        if (!req.write(chunk)) return void req.once("drain", pump);
      }
      if (!answered) req.end();
    };
    pump();
  });
}

describe("request bodies are counted as they stream and cut at the limit", () => {
  it("a chunked 300 MB body to /api/session gets 413 and leaves the server's memory within 50 MB", async () => {
    // Warm the route first, so compiling and caching it is not counted as the body's cost.
    await call("/api/session", { method: "POST", body: { email: "warm@example.test", password: "x" } });
    const before = residentBytes();
    const sent = await sendChunked("/api/session", 300 * 1000 * 1000, {
      "content-type": "application/json",
      "x-forwarded-for": randomIp(),
    });
    const after = residentBytes();
    const growthMB = (after - before) / 1e6;
    console.log(
      `[body-limits] 300 MB chunked to /api/session: ${sent.status} after ${(sent.bytesSent / 1e6).toFixed(1)} MB sent; ` +
        `server RSS ${(before / 1e6).toFixed(1)} MB → ${(after / 1e6).toFixed(1)} MB (${growthMB >= 0 ? "+" : ""}${growthMB.toFixed(1)} MB)`,
    );
    expect(sent.status).toBe(413);
    expect(JSON.parse(sent.body).error.code).toBe("payload_too_large");
    expect(growthMB).toBeLessThan(50);
    // The server answers the next request as usual.
    expect((await call("/sign-in")).status).toBe(200);
  }, 120_000);

  it("a chunked upload with no Content-Length is cut at one file's limit (413), before the form is parsed", async () => {
    const { cookie } = await instructorWithReviewer();
    const { id } = await createDraft(cookie);
    const sent = await sendChunked(`/api/applications/${id}/attachments`, 40 * 1000 * 1000, {
      "content-type": "multipart/form-data; boundary=xyz",
      cookie,
      "x-forwarded-for": randomIp(),
    });
    expect(sent.status).toBe(413);
    expect(sent.bytesSent).toBeLessThan(40 * 1000 * 1000);
  }, 60_000);

  it("a route that takes no body refuses a large one (413) instead of ignoring it", async () => {
    const { cookie } = await instructorWithReviewer();
    const out = await sendChunked("/api/session", 5 * 1000 * 1000, {
      "content-type": "application/json",
      cookie,
      "x-forwarded-for": randomIp(),
    });
    // POST /api/session takes a JSON body of at most 256 KiB: 5 MB is refused.
    expect(out.status).toBe(413);
    const res = await fetch(`${baseUrl()}/api/session`, {
      method: "DELETE",
      headers: { origin: baseUrl(), cookie, "content-type": "application/json" },
      body: "x".repeat(64 * 1024),
    });
    // DELETE /api/session takes no body: 16 KiB is the allowance (lib/http/body.ts).
    expect(res.status).toBe(413);
  }, 60_000);
});
