// Applies the committed migrations (scripts/lib/migrate.ts) as the owner (DATABASE_OWNER_URL, else DATABASE_URL)
// from the environment or .env.local.
// Run by `npm start`, `npm test` and `npm run db:migrate`.
import { closeDb } from "@/db";
import { runMigrations } from "@/scripts/lib/migrate";
import { loadLocalEnv } from "@/scripts/lib/load-env";

loadLocalEnv();
runMigrations({ log: (line) => console.log(line) })
  .then(() => console.log("  migrations applied"))
  .catch((error: unknown) => {
    console.error("migration failed:", error instanceof Error ? error.message : error);
    process.exitCode = 1;
  })
  .finally(() => closeDb());
