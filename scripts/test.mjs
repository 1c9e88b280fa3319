#!/usr/bin/env node
// `npm test`: the same services as `npm start` (PostgreSQL, a production build, the local inbox),
// fresh test databases, every vitest test, lint and typecheck, and a short benchmark run. Ends with
// `N passed, N failed`.
// Extra arguments go to vitest, e.g. `npm test -- tests/hazard`.
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import {
  bin,
  dataDir,
  appDatabaseUrl,
  databaseUrl,
  ensureAppRole,
  ensureBuild,
  ensureDatabase,
  ensureDebianPackages,
  ensureNodeModules,
  fail,
  localEnv,
  localIdpEnv,
  pgUp,
  registerUser,
  releasePg,
  requireFreePort,
  root,
  sourceHash,
  startChild,
  startLocalIdp,
  stopChild,
  step,
  stopAllChildren,
  waitForHttp,
  warn,
} from "./lib/services.mjs";
import { spawn, spawnSync } from "node:child_process";
import { nextCommand } from "./lib/next-server.mjs";

const TEST_PORT = Number(process.env.TEST_PORT ?? 3210);
const TEST_MAIL_PORT = Number(process.env.TEST_SMTP_PORT ?? 2526);
// The local identity provider institutional sign-in goes through, one for every copy (past their
// web and cluster ports: TEST_PORT + 5 × up to 4 copies).
// The local identity provider: TEST_OIDC_PORT, or a port the system says is free now (a fixed offset
// from TEST_PORT would land on another checkout's ports on a shared machine).
const TEST_OIDC_PORT = process.env.TEST_OIDC_PORT ? Number(process.env.TEST_OIDC_PORT) : await freeLoopbackPort();

function freeLoopbackPort() {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address();
      server.close(() => resolve(port));
    });
  });
}
const vitestArgs = process.argv.slice(2);
const quick = process.env.BENCHCLEAR_TEST_QUICK === "1";
// Several checkouts' or helpers' test runs can share one machine with their own database and build.
const TEST_DB = process.env.TEST_DB_NAME ?? "benchclear_test";
if (!/^[a-z_][a-z0-9_]{0,62}$/.test(TEST_DB)) throw new Error("TEST_DB_NAME must be a plain lower-case identifier");

const failures = [];

// A full run splits the test files over TEST_SHARDS copies of the test set-up (its own database,
// production server on the same build, local inbox and file store each), run at the same time. The
// files share nothing but PostgreSQL's cluster and the build, so each copy sees what a one-copy run
// sees. Files that stop PostgreSQL itself run afterwards, alone, beside lint and typecheck.
const SHARDS = vitestArgs.length === 0 ? Number(process.env.TEST_SHARDS ?? 2) : 1;
if (!Number.isInteger(SHARDS) || SHARDS < 1 || SHARDS > 4)
  throw new Error("TEST_SHARDS must be a whole number from 1 to 4");
/** Files that restart the shared PostgreSQL: nothing else may use it while they run. */
const EXCLUSIVE = ["tests/reliability/pg-restart.test.ts"];
// Seconds per file in a clean clone's full run on a 2-core machine (two copies at once), for a
// checkout with no earlier report of its own (CI): the longest files first, spread over the copies.
// A file's own entry wins over its folder's; anything not named costs DEFAULT_WEIGHT.
const WEIGHTS = {
  "tests/e2e/journey.test.ts": 142,
  "tests/cluster/cluster.test.ts": 96,
  "tests/e2e/forms-new-users.test.ts": 88,
  "tests/auth/matrix.test.ts": 82,
  "tests/e2e/application-form.test.ts": 65,
  "tests/e2e/review-chain.test.ts": 61,
  "tests/pdf/render.test.ts": 58,
  "tests/e2e/review-permit-new-users.test.ts": 58,
  "tests/jobs/reminders.test.ts": 47,
  "tests/mail/delivery.test.ts": 35,
  "tests/e2e/institution-sign-in.test.ts": 30,
  "tests/e2e/training-rereview.test.ts": 26,
  "tests/api/fuzz.test.ts": 21,
  "tests/e2e/incidents.test.ts": 16,
  "tests/e2e/upkeep.test.ts": 15,
  "tests/pdf/routes.test.ts": 14,
  "tests/e2e/pre-use-check.test.ts": 13,
  "tests/reports/demo-story-report.test.ts": 12,
  "tests/e2e/live-reports-a11y.test.ts": 11,
  "tests/rules/preview-demo-story.test.ts": 11,
  "tests/reliability/backup.test.ts": 10,
  "tests/verify/verify.test.ts": 10,
  "tests/e2e/": 8,
};
const DEFAULT_WEIGHT = 2;
const BENCH_SMOKE_STAGE = "Benchmark smoke (npm run bench -- --smoke)";
const BENCH_SMOKE_ARGS = ["scripts/bench/index.ts", "--smoke"];

function stage(name, cmd, args, env) {
  step(name);
  const started = Date.now();
  const result = spawnSync(cmd, args, { cwd: root, stdio: "inherit", env });
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  if (result.status !== 0) {
    failures.push(name);
    warn(`${name} failed (${seconds} s)`);
    return false;
  }
  console.log(`  ${name} passed (${seconds} s)`);
  return true;
}

/** Like stage(), but beside others: every output line is prefixed with `[label]`. */
function stageBeside(name, label, cmd, args, env) {
  console.log(`  started: ${name}`);
  const started = Date.now();
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd: root, env, stdio: ["ignore", "pipe", "pipe"] });
    for (const stream of [child.stdout, child.stderr]) {
      let rest = "";
      stream.setEncoding("utf8");
      stream.on("data", (chunk) => {
        const lines = (rest + chunk).split("\n");
        rest = lines.pop();
        for (const line of lines) process.stdout.write(`[${label}] ${line}\n`);
      });
      stream.on("end", () => rest && process.stdout.write(`[${label}] ${rest}\n`));
    }
    child.on("close", (code) => {
      const seconds = ((Date.now() - started) / 1000).toFixed(1);
      if (code !== 0) {
        failures.push(name);
        warn(`${name} failed (${seconds} s)`);
      } else console.log(`  ${name} passed (${seconds} s)`);
      resolve(code === 0);
    });
  });
}

/** Every test file vitest would pick up (vitest.config.ts: tests/**\/*.test.ts(x)). */
function testFiles() {
  return fs
    .readdirSync(path.join(root, "tests"), { recursive: true })
    .map((f) => path.posix.join("tests", String(f).split(path.sep).join("/")))
    .filter((f) => /\.test\.tsx?$/.test(f))
    .sort();
}

/** Seconds each file took in this checkout's last full run, where there was one. */
function earlierDurations() {
  const seen = {};
  if (!fs.existsSync(dataDir)) return seen;
  for (const name of fs.readdirSync(dataDir)) {
    if (!name.startsWith(`vitest-report-${TEST_DB}`) || !name.endsWith(".json")) continue;
    try {
      const json = JSON.parse(fs.readFileSync(path.join(dataDir, name), "utf8"));
      for (const t of json.testResults ?? []) {
        seen[path.relative(root, t.name).split(path.sep).join("/")] = (t.endTime - t.startTime) / 1000;
      }
    } catch {
      // an unreadable report only loses the hint
    }
  }
  return seen;
}

/** Longest first, each to the copy with the least so far: copies end at about the same time. */
function splitFiles(files, count) {
  const earlier = earlierDurations();
  const weight = (f) =>
    earlier[f] ?? Object.entries(WEIGHTS).find(([prefix]) => f.startsWith(prefix))?.[1] ?? DEFAULT_WEIGHT;
  const groups = Array.from({ length: count }, () => ({ files: [], seconds: 0 }));
  for (const f of [...files].sort((a, b) => weight(b) - weight(a) || a.localeCompare(b))) {
    const g = groups.reduce((a, b) => (b.seconds < a.seconds ? b : a));
    g.files.push(f);
    g.seconds += weight(f);
  }
  return groups;
}

/** A running `npm start` serves from .next; a stale build must not be replaced under it. */
function distDirForTests() {
  if (process.env.TEST_DIST_DIR) return process.env.TEST_DIST_DIR;
  const pidFile = path.join(dataDir, "run", "next-start.pid");
  if (!fs.existsSync(pidFile)) return ".next";
  try {
    process.kill(Number(fs.readFileSync(pidFile, "utf8")), 0);
  } catch {
    return ".next";
  }
  const stamp = path.join(root, ".next", ".benchclear-source-hash");
  const fresh = fs.existsSync(stamp) && fs.readFileSync(stamp, "utf8").trim() === sourceHash();
  return fresh ? ".next" : ".next-test";
}

function readReport(file) {
  if (!fs.existsSync(file)) return { passed: 0, failed: 1 };
  const json = JSON.parse(fs.readFileSync(file, "utf8"));
  let failed = (json.numFailedTests ?? 0) + (json.numRuntimeErrorTestSuites ?? 0);
  if (json.numFailedTestSuites && !failed) failed = json.numFailedTestSuites;
  return { passed: json.numPassedTests ?? 0, failed };
}

async function main() {
  const started = Date.now();
  ensureNodeModules();
  const local = localEnv();
  registerUser();
  const onSignal = async () => {
    await stopAllChildren();
    releasePg();
    process.exit(130);
  };
  process.on("SIGINT", onSignal);
  process.on("SIGTERM", onSignal);

  // Browser tests drive Debian's Chromium; PDF tests read text back with poppler's pdftotext.
  ensureDebianPackages(["chromium"], () => fs.existsSync("/usr/bin/chromium"), "browser tests");
  ensureDebianPackages(["poppler-utils"], () => fs.existsSync("/usr/bin/pdftotext"), "reading PDFs in tests");
  await pgUp(local);

  // Copy i: database TEST_DB (then TEST_DB_s2, …), web port TEST_PORT + 5i (the cluster tests use
  // the four ports after it), inbox port TEST_SMTP_PORT + 3i.
  const copies = Array.from({ length: SHARDS }, (_, i) => {
    const db = i === 0 ? TEST_DB : `${TEST_DB}_s${i + 1}`;
    const port = TEST_PORT + 5 * i;
    const mailPort = TEST_MAIL_PORT + 3 * i;
    const baseUrl = `http://127.0.0.1:${port}`;
    return {
      label: `copy ${i + 1}`,
      db,
      port,
      mailPort,
      baseUrl,
      env: {
        ...process.env,
        ...local,
        NODE_ENV: "test",
        // The code under test connects as the app's role; migrations and fixtures that need more
        // (tests/support/db.ts ownerDb) as the owner.
        DATABASE_URL: appDatabaseUrl(local, db),
        DATABASE_OWNER_URL: databaseUrl(local, db),
        APP_URL: baseUrl,
        AUTH_URL: baseUrl,
        AUTH_TRUST_HOST: "true",
        SMTP_HOST: "127.0.0.1",
        SMTP_PORT: String(mailPort),
        LOCAL_INBOX_DIR: path.join(dataDir, `mail-${db}`),
        STORAGE_DIR: path.join(dataDir, `uploads-${db}`),
        NEXT_TELEMETRY_DISABLED: "1",
        // Demo accounts and the local inbox under the production build, on this machine only.
        BENCHCLEAR_LOCAL_DEMO: "1",
        // The tests stand in for one reverse proxy: each request names its client in X-Forwarded-For
        // (tests/support/http.ts), so tests do not share one address's rate limits.
        TRUSTED_PROXY_HOPS: "1",
        // Institutional sign-in through the local identity provider (password sign-in stays on).
        ...localIdpEnv(local, TEST_OIDC_PORT),
        TEST_OIDC_PORT: String(TEST_OIDC_PORT),
      },
    };
  });

  for (const copy of copies) {
    step(`Creating a fresh test database (${copy.db})`);
    ensureDatabase(local, copy.db, { fresh: true });
  }
  ensureAppRole(local);
  for (const copy of copies) {
    fs.rmSync(copy.env.LOCAL_INBOX_DIR, { recursive: true, force: true });
    fs.rmSync(copy.env.STORAGE_DIR, { recursive: true, force: true });
    const name = copies.length > 1 ? `Migrations (${copy.db})` : "Migrations";
    if (!stage(name, bin("tsx"), ["scripts/migrate.ts"], copy.env)) throw new Error("migrations failed");
  }
  const testEnv = copies[0].env;
  // A short run of `npm run bench` (1k permits, 1 s per route) so the benchmark never rots: it fails
  // when a route errors or the harness breaks, never on speed. Only in full runs (no vitest filter).
  const benchSmoke =
    (vitestArgs.length === 0 && process.env.BENCHCLEAR_BENCH_SMOKE !== "0") ||
    process.env.BENCHCLEAR_BENCH_SMOKE === "1";
  if (!quick && copies.length === 1) {
    stage("Lint (eslint, prettier)", "npm", ["run", "--silent", "lint"], testEnv);
    stage("Typecheck (tsc)", "npm", ["run", "--silent", "typecheck"], testEnv);
  }

  const distDir = distDirForTests();
  const benchEnv = { ...testEnv, NODE_ENV: "production", NEXT_DIST_DIR: distDir };
  ensureBuild({ ...testEnv }, distDir);

  await startLocalIdp(testEnv, {
    port: TEST_OIDC_PORT,
    redirectUris: copies.map((c) => `${c.baseUrl}/api/auth/callback/institution`),
    variable: "TEST_OIDC_PORT",
    quiet: true,
  });
  const servers = [];
  for (const copy of copies) {
    await requireFreePort(copy.port, `the test web server (${copy.label})`, "TEST_PORT");
    await requireFreePort(copy.mailPort, `the test local inbox (${copy.label})`, "TEST_SMTP_PORT");
    step(`Starting the test local inbox on 127.0.0.1:${copy.mailPort}`);
    const inbox = startChild("local inbox", bin("tsx"), ["scripts/local-inbox.ts"], {
      env: { ...copy.env, INBOX_PORT: String(copy.mailPort) },
    });
    step(`Starting the production build on ${copy.baseUrl}`);
    const server = startChild("web server", ...nextCommand(["start", "-p", String(copy.port), "-H", "127.0.0.1"]), {
      env: { ...copy.env, NODE_ENV: "production", NEXT_DIST_DIR: distDir },
      stdio: ["ignore", fs.openSync(path.join(dataDir, `test-server-${copy.db}.log`), "w"), "inherit"],
    });
    servers.push({ inbox, server });
  }
  for (const [i, copy] of copies.entries()) {
    await waitForHttp(`${copy.baseUrl}/sign-in`, { child: servers[i].server, timeoutMs: 90_000 });
  }

  // The cluster tests start more servers of the same build; the server's pid: tests read its
  // resident memory from /proc/<pid>/status.
  const vitestEnv = (copy, i) => ({
    ...copy.env,
    TEST_BASE_URL: copy.baseUrl,
    TEST_DIST_DIR: distDir,
    TEST_PORT: String(copy.port),
    TEST_DB_NAME: copy.db,
    TEST_SERVER_PID: String(servers[i].server.pid),
  });
  const reportFor = (name) => path.join(dataDir, `vitest-report-${name}.json`);
  const vitestRun = (files, report) => [
    "run",
    "--reporter=default",
    "--reporter=json",
    `--outputFile.json=${report}`,
    ...files,
  ];
  const reports = [];
  for (const copy of copies) fs.rmSync(reportFor(copy.db), { force: true });
  fs.rmSync(reportFor(`${TEST_DB}-alone`), { force: true });

  if (copies.length === 1) {
    reports.push(reportFor(TEST_DB));
    stage("Vitest", bin("vitest"), vitestRun(vitestArgs, reports[0]), vitestEnv(copies[0], 0));
  } else {
    const all = testFiles();
    const groups = splitFiles(
      all.filter((f) => !EXCLUSIVE.includes(f)),
      copies.length,
    );
    step(`Vitest: ${all.length} files over ${copies.length} copies at once, then ${EXCLUSIVE.length} alone`);
    for (const [i, g] of groups.entries()) {
      console.log(`  ${copies[i].label}: ${g.files.length} files, about ${Math.round(g.seconds)} s`);
    }
    await Promise.all(
      groups.map((g, i) => {
        reports.push(reportFor(copies[i].db));
        return stageBeside(
          `Vitest (${copies[i].label})`,
          copies[i].label,
          bin("vitest"),
          vitestRun(g.files, reportFor(copies[i].db)),
          vitestEnv(copies[i], i),
        );
      }),
    );
    // Only the first copy's services stay for the files that restart PostgreSQL.
    await Promise.all(servers.slice(1).flatMap(({ inbox, server }) => [stopChild(server), stopChild(inbox)]));
    reports.push(reportFor(`${TEST_DB}-alone`));
    const checks = quick
      ? []
      : [
          stageBeside("Lint (eslint, prettier)", "lint", "npm", ["run", "--silent", "lint"], testEnv),
          stageBeside("Typecheck (tsc)", "tsc", "npm", ["run", "--silent", "typecheck"], testEnv),
        ];
    // The benchmark smoke starts its own server: it runs once the file that restarts PostgreSQL is
    // done and the test servers are stopped, beside the rest of lint and typecheck.
    const aloneThenSmoke = stageBeside(
      "Vitest (alone)",
      "alone",
      bin("vitest"),
      vitestRun(EXCLUSIVE, reportFor(`${TEST_DB}-alone`)),
      vitestEnv(copies[0], 0),
    ).then(async () => {
      await stopAllChildren();
      if (benchSmoke) await stageBeside(BENCH_SMOKE_STAGE, "bench", bin("tsx"), BENCH_SMOKE_ARGS, benchEnv);
    });
    await Promise.all([aloneThenSmoke, ...checks]);
  }

  await stopAllChildren();

  if (benchSmoke && copies.length === 1) stage(BENCH_SMOKE_STAGE, bin("tsx"), BENCH_SMOKE_ARGS, benchEnv);
  releasePg();

  let passed = 0;
  let failed = 0;
  for (const report of reports) {
    const r = readReport(report);
    passed += r.passed;
    failed += r.failed;
  }
  const seconds = ((Date.now() - started) / 1000).toFixed(0);
  if (failures.length) warn(`Failed stages: ${failures.join(", ")}`);
  console.log(`npm test took ${seconds} s`);
  // Stage failures (lint, typecheck) count as failures too, so the closing line never hides them.
  const stageFailures = failures.filter((f) => !f.startsWith("Vitest")).length;
  console.log(`${passed} passed, ${failed + stageFailures} failed`);
  process.exit(failures.length || failed ? 1 : 0);
}

main().catch(async (error) => {
  await stopAllChildren();
  releasePg();
  console.log("0 passed, 1 failed");
  fail(error);
});
