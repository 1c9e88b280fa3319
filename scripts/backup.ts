// `npm run backup [-- --out <file>]`: one archive with a consistent PostgreSQL dump, every stored
// file (uploads and rendered permits; local folder or S3 bucket) and a manifest of SHA-256 hashes
// and row counts (scripts/lib/backup.ts). Default file: .data/backups/benchclear-<UTC time>.tar.
// Runs as the owner role (DATABASE_OWNER_URL, else DATABASE_URL). Exit code 1 on failure.
import path from "node:path";
import { parseArgs } from "node:util";
import { loadLocalEnv } from "@/scripts/lib/load-env";
import { createBackup, storeFromEnv } from "@/scripts/lib/backup";

loadLocalEnv();
const { values } = parseArgs({ options: { out: { type: "string" } } });
const stamp = new Date().toISOString().replace(/[:.]/g, "-");
const outFile = path.resolve(values.out ?? path.join(".data", "backups", `benchclear-${stamp}.tar`));
const ownerUrl = process.env.DATABASE_OWNER_URL ?? process.env.DATABASE_URL;

try {
  if (!ownerUrl) throw new Error("DATABASE_OWNER_URL (or DATABASE_URL) is not set");
  const started = Date.now();
  const manifest = await createBackup({ ownerUrl, store: storeFromEnv(process.env), outFile });
  const rows = Object.values(manifest.rowCounts).reduce((a, b) => a + b, 0);
  console.log(`Backup written: ${outFile}`);
  console.log(
    `  ${Object.keys(manifest.rowCounts).length} tables, ${rows} rows; ${manifest.members.length - 1} stored files; ` +
      `${((Date.now() - started) / 1000).toFixed(1)} s`,
  );
  if (manifest.missingFiles.length) {
    console.warn(
      `  ! ${manifest.missingFiles.length} file(s) named in the database were not in the store: ${manifest.missingFiles.join(", ")}`,
    );
  }
} catch (error) {
  console.error("backup failed:", error instanceof Error ? error.message : error);
  process.exitCode = 1;
}
