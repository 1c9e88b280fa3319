// Loads .env.local (written by the start and test scripts) for TypeScript scripts run with tsx, the
// way Next.js does for the app. Real environment variables win.
import nextEnv from "@next/env";

export function loadLocalEnv(): void {
  nextEnv.loadEnvConfig(process.cwd(), process.env.NODE_ENV !== "production");
  const db = process.env.NODE_ENV === "test" ? "benchclear_test" : "benchclear";
  const at = `127.0.0.1:${process.env.PGPORT_LOCAL ?? 54329}/${db}`;
  // The app's role for the app's code (worker, clock); the owner for migrations, backups, restores.
  if (!process.env.DATABASE_URL && process.env.LOCAL_PG_APP_PASSWORD) {
    process.env.DATABASE_URL = `postgres://benchclear_app:${encodeURIComponent(process.env.LOCAL_PG_APP_PASSWORD)}@${at}`;
  }
  if (!process.env.DATABASE_OWNER_URL && process.env.LOCAL_PG_PASSWORD) {
    process.env.DATABASE_OWNER_URL = `postgres://benchclear:${encodeURIComponent(process.env.LOCAL_PG_PASSWORD)}@${at}`;
  }
}
