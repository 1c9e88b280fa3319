#!/usr/bin/env node
// `npm run cluster`: Benchclear as a small multi-server deployment on this machine — HAProxy on
// http://localhost:3000 in front of two production app servers (:3101, :3102), one job worker process,
// PostgreSQL, a local S3-compatible store (:4569) and the local inbox (:1025). Migrations run once, as
// their own step, before any server starts. Installs what is missing, as `npm start` does; Ctrl-C
// stops everything it started. Ports: CLUSTER_PORT, CLUSTER_APP_PORTS (a,b), CLUSTER_S3_PORT, SMTP_PORT.
import path from "node:path";
import { startCluster } from "./lib/cluster.mjs";
import {
  appDatabaseUrl,
  bin,
  dataDir,
  databaseUrl,
  ensureAppRole,
  ensureBuild,
  ensureDatabase,
  ensureNodeModules,
  fail,
  info,
  localEnv,
  pgUp,
  registerUser,
  releasePg,
  requireFreePort,
  run,
  startChild,
  step,
  stopAllChildren,
} from "./lib/services.mjs";

const LB_PORT = Number(process.env.CLUSTER_PORT ?? 3000);
const [A_PORT, B_PORT] = (process.env.CLUSTER_APP_PORTS ?? "3101,3102").split(",").map(Number);
const S3_PORT = Number(process.env.CLUSTER_S3_PORT ?? 4569);
const MAIL_PORT = Number(process.env.SMTP_PORT ?? 1025);
const DATABASE = "benchclear_cluster";

let cluster;
let stopping = false;
async function shutdown(code = 0) {
  if (stopping) return;
  stopping = true;
  console.log("");
  step("Stopping the load balancer, app servers, worker, S3 store and local inbox");
  await cluster?.stop().catch(() => undefined);
  await stopAllChildren();
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
  ensureDatabase(local, DATABASE);
  ensureAppRole(local);
  const lbUrl = `http://localhost:${LB_PORT}`;
  const env = {
    ...process.env,
    ...local,
    // The servers and the worker connect as the app's role; migrations and the demo data as the owner.
    DATABASE_URL: appDatabaseUrl(local, DATABASE),
    DATABASE_OWNER_URL: databaseUrl(local, DATABASE),
    APP_URL: lbUrl,
    AUTH_URL: lbUrl,
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(MAIL_PORT),
    LOCAL_INBOX_DIR: path.join(dataDir, "cluster", "mail"),
    LOG_INVITATION_LINKS: "1",
  };

  for (const [port, what, variable] of [
    [LB_PORT, "the load balancer", "CLUSTER_PORT"],
    [A_PORT, "app server a", "CLUSTER_APP_PORTS"],
    [B_PORT, "app server b", "CLUSTER_APP_PORTS"],
    [S3_PORT, "the local S3 store", "CLUSTER_S3_PORT"],
    [MAIL_PORT, "the local inbox", "SMTP_PORT"],
  ]) {
    await requireFreePort(port, what, variable);
  }

  step("Applying database migrations (once, before any app server starts)");
  run(bin("tsx"), ["scripts/migrate.ts"], { env: { ...env, NODE_ENV: "development" } });
  ensureBuild(env);

  step(`Starting the local inbox on 127.0.0.1:${MAIL_PORT}`);
  startChild("local inbox", bin("tsx"), ["scripts/local-inbox.ts"], {
    env: { ...env, NODE_ENV: "development", INBOX_PORT: String(MAIL_PORT) },
  });
  step(`Starting the S3 store, app servers on :${A_PORT} and :${B_PORT}, the worker and HAProxy on :${LB_PORT}`);
  cluster = await startCluster({
    env,
    dir: path.join(dataDir, "cluster"),
    ports: { lb: LB_PORT, a: A_PORT, b: B_PORT, s3: S3_PORT },
  });
  // The demo data goes through the same S3 store as the servers, so its files are where they look.
  step("Adding the demo data (skipped where it is already there)");
  run(bin("tsx"), ["scripts/demo-data.ts"], {
    env: { ...cluster.appEnv, NODE_ENV: "development", DATABASE_URL: env.DATABASE_OWNER_URL },
  });
  console.log("");
  step(`Benchclear (cluster) is ready: ${lbUrl}`);
  info("Demo sign-ins (password benchclear-demo-2026): instructor@, reviewer@, officer@, admin@benchclear.test");
  info(
    `Readiness of each server: ${cluster.serverUrl("a")}/api/health/ready, ${cluster.serverUrl("b")}/api/health/ready`,
  );
  info("Press Ctrl-C to stop everything.");
}

main().catch(async (error) => {
  await cluster?.stop().catch(() => undefined);
  await stopAllChildren();
  releasePg();
  fail(error);
});
