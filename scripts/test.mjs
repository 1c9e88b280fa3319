#!/usr/bin/env node
// `npm test`: the same services as `npm start` (PostgreSQL, a production build, the local inbox),
// a fresh test database, then lint, typecheck and every vitest test. Ends with `N passed, N failed`.
// Extra arguments go to vitest, e.g. `npm test -- tests/hazard`.
import fs from "node:fs";
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
  pgUp,
  registerUser,
  releasePg,
  requireFreePort,
  root,
  sourceHash,
  startChild,
  step,
  stopAllChildren,
  waitForHttp,
  warn,
} from "./lib/services.mjs";
import { spawnSync } from "node:child_process";
import { nextCommand } from "./lib/next-server.mjs";

const TEST_PORT = Number(process.env.TEST_PORT ?? 3210);
const TEST_MAIL_PORT = Number(process.env.TEST_SMTP_PORT ?? 2526);
const vitestArgs = process.argv.slice(2);
const quick = process.env.BENCHCLEAR_TEST_QUICK === "1";
// Several checkouts' or helpers' test runs can share one machine with their own database and build.
const TEST_DB = process.env.TEST_DB_NAME ?? "benchclear_test";
if (!/^[a-z_][a-z0-9_]{0,62}$/.test(TEST_DB)) throw new Error("TEST_DB_NAME must be a plain lower-case identifier");

const failures = [];

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
  step(`Creating a fresh test database (${TEST_DB})`);
  ensureDatabase(local, TEST_DB, { fresh: true });
  ensureAppRole(local);

  const baseUrl = `http://127.0.0.1:${TEST_PORT}`;
  const testEnv = {
    ...process.env,
    ...local,
    NODE_ENV: "test",
    // The code under test connects as the app's role; migrations and fixtures that need more
    // (tests/support/db.ts ownerDb) as the owner.
    DATABASE_URL: appDatabaseUrl(local, TEST_DB),
    DATABASE_OWNER_URL: databaseUrl(local, TEST_DB),
    APP_URL: baseUrl,
    AUTH_URL: baseUrl,
    AUTH_TRUST_HOST: "true",
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(TEST_MAIL_PORT),
    LOCAL_INBOX_DIR: path.join(dataDir, `mail-${TEST_DB}`),
    STORAGE_DIR: path.join(dataDir, `uploads-${TEST_DB}`),
    NEXT_TELEMETRY_DISABLED: "1",
    // Demo accounts and the local inbox under the production build, on this machine only.
    BENCHCLEAR_LOCAL_DEMO: "1",
    // The tests stand in for one reverse proxy: each request names its client in X-Forwarded-For
    // (tests/support/http.ts), so tests do not share one address's rate limits.
    TRUSTED_PROXY_HOPS: "1",
  };
  fs.rmSync(testEnv.LOCAL_INBOX_DIR, { recursive: true, force: true });
  fs.rmSync(testEnv.STORAGE_DIR, { recursive: true, force: true });

  if (!stage("Migrations", bin("tsx"), ["scripts/migrate.ts"], testEnv)) throw new Error("migrations failed");
  if (!quick) {
    stage("Lint (eslint, prettier)", "npm", ["run", "--silent", "lint"], testEnv);
    stage("Typecheck (tsc)", "npm", ["run", "--silent", "typecheck"], testEnv);
  }

  const distDir = distDirForTests();
  ensureBuild({ ...testEnv }, distDir);

  await requireFreePort(TEST_PORT, "the test web server", "TEST_PORT");
  await requireFreePort(TEST_MAIL_PORT, "the test local inbox", "TEST_SMTP_PORT");
  step(`Starting the test local inbox on 127.0.0.1:${TEST_MAIL_PORT}`);
  startChild("local inbox", bin("tsx"), ["scripts/local-inbox.ts"], {
    env: { ...testEnv, INBOX_PORT: String(TEST_MAIL_PORT) },
  });
  step(`Starting the production build on ${baseUrl}`);
  const server = startChild("web server", ...nextCommand(["start", "-p", String(TEST_PORT), "-H", "127.0.0.1"]), {
    env: { ...testEnv, NODE_ENV: "production", NEXT_DIST_DIR: distDir },
    stdio: ["ignore", fs.openSync(path.join(dataDir, `test-server-${TEST_DB}.log`), "w"), "inherit"],
  });
  await waitForHttp(`${baseUrl}/sign-in`, { child: server, timeoutMs: 90_000 });

  const report = path.join(dataDir, `vitest-report-${TEST_DB}.json`);
  fs.rmSync(report, { force: true });
  stage(
    "Vitest",
    bin("vitest"),
    ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${report}`, ...vitestArgs],
    // The cluster tests start more servers of the same build; the server's pid: tests read its
    // resident memory from /proc/<pid>/status.
    {
      ...testEnv,
      TEST_BASE_URL: baseUrl,
      TEST_DIST_DIR: distDir,
      TEST_PORT: String(TEST_PORT),
      TEST_DB_NAME: TEST_DB,
      TEST_SERVER_PID: String(server.pid),
    },
  );

  await stopAllChildren();

  // A short run of `npm run bench` (1k permits, 1 s per route) so the benchmark never rots: it fails
  // when a route errors or the harness breaks, never on speed. Only in full runs (no vitest filter).
  if (
    (vitestArgs.length === 0 && process.env.BENCHCLEAR_BENCH_SMOKE !== "0") ||
    process.env.BENCHCLEAR_BENCH_SMOKE === "1"
  ) {
    stage("Benchmark smoke (npm run bench -- --smoke)", bin("tsx"), ["scripts/bench/index.ts", "--smoke"], {
      ...testEnv,
      NODE_ENV: "production",
      NEXT_DIST_DIR: distDir,
    });
  }
  releasePg();

  let passed = 0;
  let failed = 0;
  if (fs.existsSync(report)) {
    const json = JSON.parse(fs.readFileSync(report, "utf8"));
    passed = json.numPassedTests ?? 0;
    failed = (json.numFailedTests ?? 0) + (json.numRuntimeErrorTestSuites ?? 0);
    if (json.numFailedTestSuites && !failed) failed = json.numFailedTestSuites;
  } else {
    failed = 1;
  }
  const seconds = ((Date.now() - started) / 1000).toFixed(0);
  if (failures.length) warn(`Failed stages: ${failures.join(", ")}`);
  console.log(`npm test took ${seconds} s`);
  // Stage failures (lint, typecheck) count as failures too, so the closing line never hides them.
  const stageFailures = failures.filter((f) => f !== "Vitest").length;
  console.log(`${passed} passed, ${failed + stageFailures} failed`);
  process.exit(failures.length || failed ? 1 : 0);
}

main().catch(async (error) => {
  await stopAllChildren();
  releasePg();
  console.log("0 passed, 1 failed");
  fail(error);
});
