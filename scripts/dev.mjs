#!/usr/bin/env node
// `npm run dev`: PostgreSQL, migrations and seed as for `npm start`, then `next dev` with hot reload
// on http://localhost:3000 and the local inbox. Ctrl-C stops what it started.
import {
  bin,
  appDatabaseUrl,
  databaseUrl,
  ensureAppRole,
  ensureDatabase,
  ensureNodeModules,
  fail,
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
import { nextCommand } from "./lib/next-server.mjs";

const PORT = Number(process.env.PORT ?? 3000);
const MAIL_PORT = Number(process.env.SMTP_PORT ?? 1025);

try {
  ensureNodeModules();
  const local = localEnv();
  registerUser();
  await pgUp(local);
  ensureDatabase(local, "benchclear");
  ensureAppRole(local);
  const env = {
    ...process.env,
    ...local,
    NODE_ENV: "development",
    // The app connects as its own role; migrations and the demo data run as the owner.
    DATABASE_URL: local.DATABASE_URL ?? appDatabaseUrl(local, "benchclear"),
    DATABASE_OWNER_URL: local.DATABASE_OWNER_URL ?? databaseUrl(local, "benchclear"),
    APP_URL: `http://localhost:${PORT}`,
    AUTH_TRUST_HOST: "true",
    SMTP_PORT: String(MAIL_PORT),
    NEXT_TELEMETRY_DISABLED: "1",
  };
  run(bin("tsx"), ["scripts/migrate.ts"], { env });
  run(bin("tsx"), ["scripts/demo-data.ts"], { env: { ...env, DATABASE_URL: env.DATABASE_OWNER_URL } });
  await requireFreePort(PORT, "the dev server", "PORT");
  await requireFreePort(MAIL_PORT, "the local inbox", "SMTP_PORT");
  startChild("local inbox", bin("tsx"), ["scripts/local-inbox.ts"], {
    env: { ...env, INBOX_PORT: String(MAIL_PORT) },
  });
  step(`next dev on http://localhost:${PORT}`);
  const server = startChild("dev server", ...nextCommand(["dev", "-p", String(PORT)]), {
    env: { ...env, WORKER_IN_APP: local.WORKER_IN_APP ?? "true" },
  });
  const stop = async () => {
    await stopAllChildren();
    releasePg();
    process.exit(0);
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
  server.on("exit", stop);
} catch (error) {
  await stopAllChildren();
  releasePg();
  fail(error);
}
