// Applies the committed SQL migrations in db/migrations to DATABASE_URL. Run by `npm start`,
// `npm test` and `npm run db:migrate`; never by `next build`.
import path from "node:path";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import { loadLocalEnv } from "@/scripts/lib/load-env";
import { closeDb, getDb } from "./index";

export async function runMigrations(): Promise<void> {
  await migrate(getDb(), { migrationsFolder: path.join(import.meta.dirname, "migrations") });
}

if (import.meta.url === `file://${process.argv[1]}`) {
  loadLocalEnv();
  runMigrations()
    .then(() => console.log("  migrations applied"))
    .catch((error: unknown) => {
      console.error("migration failed:", error instanceof Error ? error.message : error);
      process.exitCode = 1;
    })
    .finally(() => closeDb());
}
