// Applies the committed SQL migrations in db/migrations to the database client's DATABASE_URL. Run
// through scripts/migrate.ts by `npm start`, `npm test` and `npm run db:migrate`; never by `next build`.
import path from "node:path";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import { getDb } from "./index";

export async function runMigrations(): Promise<void> {
  await migrate(getDb(), { migrationsFolder: path.join(import.meta.dirname, "migrations") });
}
