// The pieces of a local multi-server deployment, shared by `npm run cluster` and the cluster tests:
// HAProxy (Debian's package) in front of two production app servers, one job worker process, a local
// S3-compatible store and the local inbox — every one on 127.0.0.1. Plain Node.js.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { nextCommand } from "./next-server.mjs";
import { bin, ensureDebianPackages, SetupError, startChild, stopChild, waitForHttp } from "./services.mjs";

export const HAPROXY = "/usr/sbin/haproxy";

export function ensureHaproxy() {
  ensureDebianPackages(["haproxy"], () => fs.existsSync(HAPROXY), "the load balancer of the local cluster");
}

/**
 * The load balancer's configuration. Readiness (/api/health/ready) decides who gets traffic: checked
 * every second with up to 4 s for an answer (a busy server is slow, not gone), out after 3 failures,
 * back after 2 successes, so a draining server (503 for SHUTDOWN_DRAIN_MS = 5 s here) leaves rotation
 * before it stops accepting. A request that could not reach a server at all is sent to the other one;
 * other failures are retried only for methods that are safe to repeat.
 */
export function haproxyConfig({ lbPort, servers }) {
  return `global
  maxconn 4096

defaults
  mode http
  timeout connect 2s
  timeout client 60s
  timeout server 60s
  timeout http-request 15s
  timeout check 4s
  retries 3
  option redispatch 1
  retry-on conn-failure empty-response response-timeout
  option forwardfor

frontend web
  bind 127.0.0.1:${lbPort}
  http-request disable-l7-retry if METH_POST || METH_PUT || { method PATCH } || { method DELETE }
  default_backend app

backend app
  balance roundrobin
  option httpchk GET /api/health/ready
  http-check expect status 200
  default-server inter 1s fall 3 rise 2
${servers.map((s) => `  server ${s.name} 127.0.0.1:${s.port} check`).join("\n")}
`;
}

/**
 * Starts the cluster and returns handles. `env` is the app's environment (DATABASE_URL, AUTH_SECRET,
 * SMTP_*…); storage is switched to the local S3 store; the app servers run without the in-process
 * worker and drain on SIGTERM.
 */
export async function startCluster({ env, distDir = ".next", dir, ports, bucket = "benchclear", quiet = false }) {
  ensureHaproxy();
  fs.mkdirSync(dir, { recursive: true });
  const log = (name) => fs.openSync(path.join(dir, `${name}.log`), "a");
  const stdio = (name) => (quiet ? ["ignore", log(name), log(name)] : "inherit");
  const lbUrl = `http://127.0.0.1:${ports.lb}`;

  const appEnv = {
    ...env,
    NODE_ENV: "production",
    NEXT_DIST_DIR: distDir,
    NEXT_TELEMETRY_DISABLED: "1",
    APP_URL: env.APP_URL ?? lbUrl,
    AUTH_URL: env.AUTH_URL ?? env.APP_URL ?? lbUrl,
    AUTH_TRUST_HOST: "true",
    // One proxy (HAProxy) stands between the client and each app server.
    TRUSTED_PROXY_HOPS: "1",
    // Every piece on 127.0.0.1 with the local inbox and the demo accounts (lib/env.ts).
    BENCHCLEAR_LOCAL_DEMO: env.BENCHCLEAR_LOCAL_DEMO ?? "1",
    WORKER_IN_APP: "false",
    NEXT_MANUAL_SIG_HANDLE: "true",
    // Longer than the balancer needs to see three failed checks (3 × 1 s, each up to 4 s when busy).
    SHUTDOWN_DRAIN_MS: env.SHUTDOWN_DRAIN_MS ?? "5000",
    STORAGE_DRIVER: "s3",
    S3_BUCKET: bucket,
    S3_ENDPOINT: `http://127.0.0.1:${ports.s3}`,
    S3_REGION: "us-east-1",
    S3_FORCE_PATH_STYLE: "true",
    S3_ACCESS_KEY_ID: "S3RVER",
    S3_SECRET_ACCESS_KEY: "S3RVER",
    // The SDK's version is pinned with the project (Node 20 here); its notice about future releases
    // needing Node 22 says nothing about this deployment and would repeat in every process's log.
    AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: "true",
  };

  const s3 = startChild("local S3 store", process.execPath, [path.join("scripts", "local-s3.mjs")], {
    env: { ...appEnv, S3_LOCAL_PORT: String(ports.s3), S3_LOCAL_DIR: path.join(dir, "s3") },
    stdio: stdio("s3"),
  });
  await waitForPort(ports.s3, s3);

  const servers = new Map();
  const startServer = async (name) => {
    const port = ports[name];
    // With the peer-address preload (lib/http/client-ip.ts): production refuses to start without it.
    const child = startChild(`app server ${name}`, ...nextCommand(["start", "-p", String(port), "-H", "127.0.0.1"]), {
      env: { ...appEnv, PORT: String(port) },
      stdio: stdio(`app-${name}`),
    });
    servers.set(name, child);
    await waitForReady(`http://127.0.0.1:${port}`, child);
    return child;
  };
  await Promise.all([startServer("a"), startServer("b")]);

  const worker = startChild("worker", bin("tsx"), ["scripts/worker.ts"], { env: appEnv, stdio: stdio("worker") });

  const cfg = path.join(dir, "haproxy.cfg");
  fs.writeFileSync(
    cfg,
    haproxyConfig({
      lbPort: ports.lb,
      servers: [
        { name: "a", port: ports.a },
        { name: "b", port: ports.b },
      ],
    }),
  );
  const check = spawnCheck(cfg);
  if (check) throw new SetupError(`haproxy refused its configuration:\n${check}`);
  const lb = startChild("load balancer", HAPROXY, ["-db", "-f", cfg], { stdio: stdio("haproxy") });
  await waitForReady(lbUrl, lb);

  return {
    url: lbUrl,
    appEnv,
    serverUrl: (name) => `http://127.0.0.1:${ports[name]}`,
    server: (name) => servers.get(name),
    startServer,
    /** Sends a signal to one app server's process group and waits for it to exit. */
    async signalServer(name, signal) {
      const child = servers.get(name);
      if (!child || child.exitCode !== null || child.signalCode !== null) return;
      const exited = new Promise((resolve) => child.once("exit", resolve));
      process.kill(-child.pid, signal);
      await exited;
    },
    async stop() {
      await stopChild(lb);
      await Promise.all([...servers.values()].map((c) => stopChild(c)));
      await stopChild(worker);
      await stopChild(s3);
    },
  };
}

function spawnCheck(cfg) {
  const result = spawnSync(HAPROXY, ["-c", "-q", "-f", cfg], { encoding: "utf8" });
  return result.status === 0 ? null : (result.stderr || result.stdout).trim();
}

async function waitForReady(url, child) {
  await waitForHttp(`${url}/api/health/ready`, { child, timeoutMs: 120_000, okOnly: true });
}

async function waitForPort(port, child) {
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new SetupError(`${child.label} exited with code ${child.exitCode}`);
    try {
      await fetch(`http://127.0.0.1:${port}/`);
      return;
    } catch {
      await new Promise((r) => setTimeout(r, 200));
    }
  }
  throw new SetupError(`nothing answered on 127.0.0.1:${port} within 30 s`);
}
