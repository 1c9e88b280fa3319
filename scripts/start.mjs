#!/usr/bin/env node
// `npm start`: install what is missing, start PostgreSQL, migrate, seed the demo data once, build when
// stale, then serve on http://localhost:3000 with the local inbox and the job worker. Ctrl-C stops
// what it started.
import {
  bin,
  appDatabaseUrl,
  databaseUrl,
  ensureAppRole,
  ensureBuild,
  ensureDatabase,
  ensureNodeModules,
  fail,
  info,
  localEnv,
  localIdpEnv,
  startLocalIdp,
  pgUp,
  registerUser,
  releasePg,
  requireFreePort,
  run,
  startChild,
  step,
  stopAllChildren,
  waitForHttp,
} from "./lib/services.mjs";
import fs from "node:fs";
import path from "node:path";
import { dataDir } from "./lib/services.mjs";
import { nextCommand } from "./lib/next-server.mjs";

const PORT = Number(process.env.PORT ?? 3000);
const MAIL_PORT = Number(process.env.SMTP_PORT ?? 1025);
const pidFile = path.join(dataDir, "run", "next-start.pid");
// BENCHCLEAR_DEMO_SSO=1: the demo signs in through the local identity provider (scripts/local-idp.mjs)
// on LOCAL_IDP_PORT, as a university's staff would through theirs.
const IDP_PORT = Number(process.env.LOCAL_IDP_PORT ?? 3009);

let shuttingDown = false;
async function shutdown(code = 0) {
  if (shuttingDown) return;
  shuttingDown = true;
  console.log("");
  step("Stopping the app, the local inbox and the worker");
  await stopAllChildren();
  fs.rmSync(pidFile, { force: true });
  releasePg();
  process.exit(code);
}

async function main() {
  ensureNodeModules();
  const local = localEnv();
  registerUser();
  process.on("SIGINT", () => shutdown(0));
  process.on("SIGTERM", () => shutdown(0));

  await pgUp(local);
  ensureDatabase(local, "benchclear");
  ensureAppRole(local);
  const appEnv = {
    ...process.env,
    ...local,
    // The app connects as its own role; migrations and the demo data run as the owner.
    DATABASE_URL: local.DATABASE_URL ?? appDatabaseUrl(local, "benchclear"),
    DATABASE_OWNER_URL: local.DATABASE_OWNER_URL ?? databaseUrl(local, "benchclear"),
    APP_URL: local.APP_URL ?? `http://localhost:${PORT}`,
    AUTH_URL: local.AUTH_URL ?? local.APP_URL ?? `http://localhost:${PORT}`,
    AUTH_TRUST_HOST: "true",
    SMTP_PORT: String(MAIL_PORT),
    LOG_INVITATION_LINKS: local.LOG_INVITATION_LINKS ?? "1",
    // The production build on this machine with demo accounts and the local inbox: allowed only
    // because APP_URL is loopback (lib/env.ts); a deployment never sets it.
    BENCHCLEAR_LOCAL_DEMO: local.BENCHCLEAR_LOCAL_DEMO ?? "1",
    NEXT_TELEMETRY_DISABLED: "1",
  };
  const demoSso = ["1", "true"].includes(String(local.BENCHCLEAR_DEMO_SSO ?? "")) && !local.OIDC_ISSUER;
  if (demoSso) Object.assign(appEnv, localIdpEnv(local, IDP_PORT));

  step("Applying database migrations");
  run(bin("tsx"), ["scripts/migrate.ts"], { env: { ...appEnv, NODE_ENV: "development" } });
  step("Seeding demo data (skipped where it is already there)");
  run(bin("tsx"), ["scripts/demo-data.ts"], {
    env: { ...appEnv, NODE_ENV: "development", DATABASE_URL: appEnv.DATABASE_OWNER_URL },
  });

  ensureBuild(appEnv);

  await requireFreePort(PORT, "the web server", "PORT");
  await requireFreePort(MAIL_PORT, "the local inbox", "SMTP_PORT");

  step(`Starting the local inbox on 127.0.0.1:${MAIL_PORT}`);
  const inbox = startChild("local inbox", bin("tsx"), ["scripts/local-inbox.ts"], {
    env: { ...appEnv, NODE_ENV: "development", INBOX_PORT: String(MAIL_PORT) },
  });
  inbox.on("exit", (code) => !shuttingDown && (console.error(`local inbox exited (${code})`), shutdown(1)));

  if (demoSso) {
    const idp = await startLocalIdp(appEnv, { port: IDP_PORT, appUrl: appEnv.APP_URL, variable: "LOCAL_IDP_PORT" });
    idp.on("exit", (code) => !shuttingDown && (console.error(`local identity provider exited (${code})`), shutdown(1)));
  }

  step(`Starting Benchclear on http://localhost:${PORT}`);
  const server = startChild("web server", ...nextCommand(["start", "-p", String(PORT), "-H", "127.0.0.1"]), {
    env: { ...appEnv, NODE_ENV: "production", WORKER_IN_APP: local.WORKER_IN_APP ?? "true" },
  });
  fs.writeFileSync(pidFile, String(server.pid));
  server.on("exit", (code) => !shuttingDown && (console.error(`web server exited (${code})`), shutdown(1)));
  await waitForHttp(`http://127.0.0.1:${PORT}/sign-in`, { child: server });

  console.log("");
  step(`Benchclear is ready: http://localhost:${PORT}`);
  info("Demo sign-ins (password benchclear-demo-2026): instructor@, reviewer@, officer@, admin@benchclear.test");
  if (demoSso) {
    info(
      `Institutional sign-in: the local identity provider on http://127.0.0.1:${IDP_PORT} (nhalvorsen, treyne, ebrandt; password aldermere-idp-2026)`,
    );
  }
  info(`Caught e-mail: http://localhost:${PORT}/dev/mail (as admin). Press Ctrl-C to stop.`);
}

main().catch(async (error) => {
  await stopAllChildren();
  releasePg();
  fail(error);
});
