// `npm run restore -- <file> [--database <name>] [--storage-dir <dir>] [--replace]`: rebuilds a fresh
// database and file store from a backup archive and checks every hash and row count against its
// manifest (scripts/lib/backup.ts). By default it restores into the database of DATABASE_OWNER_URL
// (refused when that exists, unless --replace) and the configured file store (refused unless empty).
// To test a backup without touching the live data, name another database and folder:
//   npm run restore -- .data/backups/benchclear-….tar --database benchclear_restore_check --storage-dir /tmp/restore-check
import { parseArgs } from "node:util";
import { loadLocalEnv } from "@/scripts/lib/load-env";
import { restoreBackup, storeFromEnv } from "@/scripts/lib/backup";

loadLocalEnv();
const { values, positionals } = parseArgs({
  allowPositionals: true,
  options: { database: { type: "string" }, "storage-dir": { type: "string" }, replace: { type: "boolean" } },
});
const ownerUrl = process.env.DATABASE_OWNER_URL ?? process.env.DATABASE_URL;

try {
  const file = positionals[0];
  if (!file) throw new Error("name the archive: npm run restore -- <file>");
  if (!ownerUrl) throw new Error("DATABASE_OWNER_URL (or DATABASE_URL) is not set");
  const database = values.database ?? decodeURIComponent(new URL(ownerUrl).pathname.slice(1));
  const result = await restoreBackup({
    file,
    ownerUrl,
    database,
    store: storeFromEnv(process.env, values["storage-dir"]),
    replace: values.replace,
    log: (line) => console.log(line),
  });
  console.log(
    `Restored ${file} (taken ${result.manifest.createdAt}) into ${database}: every hash and row count matches.`,
  );
} catch (error) {
  console.error("restore failed:", error instanceof Error ? error.message : error);
  process.exitCode = 1;
}
