// Several app servers behind a load balancer, against the real pieces on loopback: HAProxy (Debian's
// package), two production servers of the build `npm test` made, a separate worker process, a local
// S3-compatible store spoken to through the AWS SDK, the test database and the test's local inbox.
// What must hold when the product runs on more than one process: sessions, files, rendered permits,
// limits and jobs agree across servers, and losing or restarting a server loses no acknowledged write.
import { spawn } from "node:child_process";
import path from "node:path";
import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applications, auditEvents } from "@/db/schema";
import { queueMail } from "@/lib/outbox";
import { startCluster, type Cluster, type ServerName } from "@/scripts/lib/cluster.mjs";
import { pdfBytes } from "../applications/support";
import { caughtTo, waitFor } from "../jobs/support";
import { createPermitFixture } from "../pdf/support";
import { createDepartment, createUser, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";

requireDatabase();

const basePort = Number(process.env.TEST_PORT ?? 3210);
const ports = { lb: basePort + 1, a: basePort + 2, b: basePort + 3, s3: basePort + 4 };
let cluster: Cluster;

/** An instructor who may start drafts (that needs a department). */
async function instructor() {
  const department = await createDepartment();
  return createUser({ roles: ["instructor"], departmentId: department.id });
}

beforeAll(async () => {
  // The test server's own address must not leak into the cluster: it serves on the balancer's.
  const env = { ...process.env } as Record<string, string | undefined>;
  delete env.APP_URL;
  delete env.AUTH_URL;
  delete env.TEST_BASE_URL;
  cluster = await startCluster({
    env,
    distDir: process.env.TEST_DIST_DIR ?? ".next",
    dir: path.join(".data", `cluster-${process.env.TEST_DB_NAME ?? "benchclear_test"}`),
    ports,
    bucket: uniq("bucket").toLowerCase(),
    quiet: true,
  });
}, 240_000);

afterAll(async () => {
  await cluster?.stop();
}, 60_000);

type Answer = { status: number; text: string; json: Record<string, any> | undefined; headers: Headers };

async function call(
  base: string,
  route: string,
  options: { method?: string; body?: unknown; cookie?: string; form?: FormData } = {},
): Promise<Answer> {
  const headers: Record<string, string> = { origin: base };
  if (options.cookie) headers.cookie = options.cookie;
  let body: BodyInit | undefined;
  if (options.form) body = options.form;
  else if (options.body !== undefined) {
    body = JSON.stringify(options.body);
    headers["content-type"] = "application/json";
  }
  const res = await fetch(base + route, { method: options.method ?? "GET", headers, body, redirect: "manual" });
  const text = await res.text();
  let json: Record<string, any> | undefined;
  try {
    json = text ? JSON.parse(text) : undefined;
  } catch {
    json = undefined;
  }
  return { status: res.status, text, json, headers: res.headers };
}

async function signInAt(base: string, email: string): Promise<string> {
  const res = await call(base, "/api/session", { method: "POST", body: { email, password: TEST_PASSWORD } });
  expect(res.status, res.text).toBe(200);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .filter((c) => !c.endsWith("="))
    .join("; ");
}

async function newDraft(base: string, cookie: string): Promise<{ id: string; version: number }> {
  const res = await call(base, "/api/applications", { method: "POST", cookie, body: {} });
  expect(res.status, res.text).toBe(201);
  return { id: res.json!.application.id, version: res.json!.application.version };
}

describe("two app servers behind the load balancer", () => {
  it("accepts on server B a session made through server A", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const cookie = await signInAt(cluster.serverUrl("a"), user.email);
    const onB = await call(cluster.serverUrl("b"), "/api/applications", { cookie });
    expect(onB.status, onB.text).toBe(200);
    const signedOut = await call(cluster.serverUrl("b"), "/api/applications");
    expect(signedOut.status).toBe(401);
  });

  it("serves through server B a file uploaded through server A (one S3 store)", async () => {
    const user = await instructor();
    const cookie = await signInAt(cluster.serverUrl("a"), user.email);
    const draft = await newDraft(cluster.serverUrl("a"), cookie);
    const form = new FormData();
    const bytes = pdfBytes();
    form.append("file", new Blob([new Uint8Array(bytes)], { type: "application/pdf" }), "wiring.pdf");
    const up = await call(cluster.serverUrl("a"), `/api/applications/${draft.id}/attachments`, {
      method: "POST",
      cookie,
      form,
    });
    expect(up.status, up.text).toBe(201);
    const attachmentId = up.json!.attachment.id as string;
    const res = await fetch(`${cluster.serverUrl("b")}/api/applications/${draft.id}/attachments/${attachmentId}`, {
      headers: { cookie },
    });
    expect(res.status).toBe(200);
    expect(Buffer.from(await res.arrayBuffer()).equals(bytes)).toBe(true);
  });

  it("renders a permit PDF once: the other server serves it from storage", async () => {
    const holder = await createUser({ roles: ["instructor"] });
    const f = await createPermitFixture({ holder });
    const cookie = await signInAt(cluster.serverUrl("a"), holder.email);
    const fromA = await fetch(`${cluster.serverUrl("a")}/permits/${f.permit.id}/pdf`, { headers: { cookie } });
    expect(fromA.status).toBe(200);
    const fromB = await fetch(`${cluster.serverUrl("b")}/permits/${f.permit.id}/pdf`, { headers: { cookie } });
    expect(fromB.status).toBe(200);
    expect(Buffer.from(await fromB.arrayBuffer()).equals(Buffer.from(await fromA.arrayBuffer()))).toBe(true);
    const rendered = await getDb()
      .select({ n: sql<number>`count(*)::int` })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, f.permit.id), eq(auditEvents.action, "permit.pdf_rendered")));
    expect(rendered[0].n).toBe(1);
  }, 90_000);

  it("holds the sign-in throttle across both servers", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const statuses: number[] = [];
    for (let i = 0; i < 7; i++) {
      const server: ServerName = i % 2 === 0 ? "a" : "b";
      const res = await call(cluster.serverUrl(server), "/api/session", {
        method: "POST",
        body: { email: user.email, password: "not the password at all" },
      });
      statuses.push(res.status);
    }
    // Per-e-mail limit of 5 failures (lib/auth): the 6th and 7th attempts are refused on either server.
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401]);
    expect(statuses.slice(5)).toEqual([429, 429]);
  });

  it("sends each queued e-mail exactly once with two worker processes", async () => {
    const second = spawn(path.join("node_modules", ".bin", "tsx"), ["scripts/worker.ts"], {
      env: cluster.appEnv as NodeJS.ProcessEnv,
      stdio: "ignore",
    });
    try {
      const to = Array.from({ length: 12 }, () => `${uniq("twice")}@example.test`);
      await getDb().transaction(async (tx) => {
        for (const address of to) {
          await queueMail(tx, address, {
            kind: "invitation",
            data: {
              name: "Cluster check",
              invitedBy: "The test",
              url: `${cluster.url}/sign-in`,
              expiresAt: "2099-01-01",
            },
          });
        }
      });
      await waitFor(() => to.every((a) => caughtTo(a).length > 0) || null, 60_000);
      // Give a duplicate every chance to arrive before counting.
      await new Promise((r) => setTimeout(r, 3_000));
      expect(to.map((a) => caughtTo(a).length)).toEqual(to.map(() => 1));
    } finally {
      second.kill("SIGTERM");
    }
  }, 90_000);
});

type Load = {
  ok: number;
  /** When each 2xx answer came, in ms from the start of the load. */
  okAt: number[];
  failed: { status: number | string; at: number }[];
  writes: Map<string, Acked>;
};
type Acked = { version: number; title: string };

/**
 * Mixed load through the balancer for `ms`: each of `workers` loops reads the application list and
 * saves its own draft (autosave), one request at a time. Records every failure and the last
 * acknowledged save of each draft.
 */
async function mixedLoad(
  cookie: string,
  drafts: { id: string; version: number }[],
  ms: number,
  during: () => Promise<void>,
) {
  const load: Load = { ok: 0, okAt: [], failed: [], writes: new Map() };
  const started = Date.now();
  // The load runs for at least `ms`, and on until what happens `during` it has finished, plus 2 s.
  let stopAt = started + ms;
  let finished = false;
  const happening = during().then(() => {
    finished = true;
    stopAt = Math.max(stopAt, Date.now() + 2_000);
  });
  const loops = drafts.map(async (draft, i) => {
    let version = draft.version;
    let n = 0;
    while (!finished || Date.now() < stopAt) {
      n++;
      try {
        if (n % 2 === 0) {
          const res = await call(cluster.url, "/api/applications", { cookie });
          if (res.status === 200) {
            load.ok++;
            load.okAt.push(Date.now() - started);
          } else load.failed.push({ status: res.status, at: Date.now() - started });
        } else {
          const title = `Draft ${i} save ${n}`;
          const res = await call(cluster.url, `/api/applications/${draft.id}/draft`, {
            method: "PATCH",
            cookie,
            body: { expectedVersion: version, step: 1, draft: { event: { title } } },
          });
          if (res.status === 200) {
            load.ok++;
            load.okAt.push(Date.now() - started);
            version = res.json!.application.version;
            load.writes.set(draft.id, { version, title });
          } else {
            load.failed.push({ status: res.status, at: Date.now() - started });
            // A save whose answer was lost may still have landed: start again from what is stored.
            const now = await call(cluster.url, `/api/applications/${draft.id}/draft`, { cookie });
            if (now.status === 200) version = now.json!.application.version;
          }
        }
      } catch (error) {
        load.failed.push({ status: (error as Error).message, at: Date.now() - started });
      }
    }
  });
  await happening;
  await Promise.all(loops);
  return load;
}

async function expectAcknowledgedWritesStored(load: Load) {
  for (const [id, acked] of load.writes) {
    const [row] = await getDb()
      .select({ version: applications.version, draft: applications.draft })
      .from(applications)
      .where(eq(applications.id, id));
    expect(row.version).toBeGreaterThanOrEqual(acked.version);
    if (row.version === acked.version) {
      expect((row.draft as { event?: { title?: string } }).event?.title).toBe(acked.title);
    }
  }
}

describe("losing and restarting servers under load", () => {
  async function loadSetUp() {
    const user = await instructor();
    const cookie = await signInAt(cluster.url, user.email);
    const drafts = await Promise.all(Array.from({ length: 6 }, () => newDraft(cluster.url, cookie)));
    return { cookie, drafts };
  }

  it("carries on when server A is killed (SIGKILL); every acknowledged write is stored", async () => {
    const { cookie, drafts } = await loadSetUp();
    const load = await mixedLoad(cookie, drafts, 12_000, async () => {
      await new Promise((r) => setTimeout(r, 4_000));
      await cluster.signalServer("a", "SIGKILL");
    });
    console.log(
      `[cluster] SIGKILL of server A under load: ${load.ok} requests answered 2xx, ${load.failed.length} failed` +
        (load.failed.length ? ` (${load.failed.map((f) => `${f.status}@${f.at}ms`).join(", ")})` : ""),
    );
    // Only requests that server A was holding when it died may fail: at most one per load loop.
    expect(load.failed.length).toBeLessThanOrEqual(drafts.length);
    // B carried on: answers kept coming after the kill, and nothing failed in the last 4 s of the run.
    expect(load.okAt.filter((at) => at > 5_000).length).toBeGreaterThan(drafts.length);
    expect(load.failed.filter((f) => f.at > 8_000)).toEqual([]);
    await expectAcknowledgedWritesStored(load);
    await cluster.startServer("a");
  }, 120_000);

  it("loses no request in a rolling restart (SIGTERM A, then B)", async () => {
    const { cookie, drafts } = await loadSetUp();
    const started = Date.now();
    const load = await mixedLoad(cookie, drafts, 5_000, async () => {
      await new Promise((r) => setTimeout(r, 1_000));
      for (const name of ["a", "b"] as const) {
        await cluster.signalServer(name, "SIGTERM");
        await cluster.startServer(name);
        // The balancer needs two good checks (2 × 1 s) before it sends traffic to it again.
        await new Promise((r) => setTimeout(r, 3_000));
      }
    });
    console.log(`[cluster] rolling restart under load: ${load.ok} requests answered 2xx, ${load.failed.length} failed`);
    expect(load.failed).toEqual([]);
    // The load really ran through both restarts: every loop was answered more than once.
    expect(load.ok).toBeGreaterThanOrEqual(drafts.length * 2);
    console.log(
      `[cluster] rolling restart: ${Math.round((Date.now() - started) / 1000)} s, last answer at ${Math.max(...load.okAt)} ms`,
    );
    await expectAcknowledgedWritesStored(load);
  }, 180_000);
});
