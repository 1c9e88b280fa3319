import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { drizzle } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { writeAudit } from "@/lib/audit";
import { verifyAuditChain } from "@/lib/records/verify";
import { createBackup, restoreBackup } from "@/scripts/lib/backup";
import { createDepartment, requireDatabase, uniq } from "../support/db";
import { completeDraft, createDraft, pngBytes, saveDraft, signedInInstructor, upload } from "../applications/support";

requireDatabase();

// Issue 14, backups: `npm run backup` / `npm run restore` (scripts/lib/backup.ts). A backup taken
// while drafts are saved and audit rows written restores into a fresh database and a fresh file
// store with the row counts of the dump's snapshot and the SHA-256 of every stored file, and the
// restored audit chain still verifies. SHA-256 is checked with `sha256sum` (GNU coreutils), an
// implementation outside the project.

function sha256sum(file: string): string {
  return execFileSync("sha256sum", [file], { encoding: "utf8" }).split(" ")[0];
}

describe("backup and restore", () => {
  it("a backup taken under load restores with equal row counts and file hashes", { timeout: 120_000 }, async () => {
    const { cookie, user: instructor } = await signedInInstructor((await createDepartment()).id);
    const draft = await createDraft(cookie);
    for (let i = 0; i < 3; i++) {
      const res = await upload(cookie, draft.id, pngBytes(8 + i, 8), `bench-${i}.png`, "image/png");
      expect(res.status, res.text).toBe(201);
    }
    const storeDir = process.env.STORAGE_DIR!;
    const out = path.join(os.tmpdir(), `benchclear-backup-test-${uniq("b")}.tar`);
    const restoreDir = fs.mkdtempSync(path.join(os.tmpdir(), "benchclear-restore-store-"));
    const database = `${process.env.TEST_DB_NAME ?? "benchclear_test"}_restore`;

    let load = true;
    let writes = 0;
    const loader = (async () => {
      let version = draft.version;
      while (load) {
        const res = await saveDraft(
          cookie,
          draft.id,
          version,
          completeDraft(instructor, { title: `Backup load ${writes}` }),
        );
        if (res.status === 200) version = res.json!.application.version;
        await writeAudit(getDb(), { actor: null, action: "test.backup_load", entityType: "test", entityId: uniq("l") });
        writes++;
      }
    })();
    let manifest;
    try {
      manifest = await createBackup({
        ownerUrl: process.env.DATABASE_OWNER_URL!,
        store: { driver: "local", dir: storeDir },
        outFile: out,
      });
    } finally {
      load = false;
      await loader;
    }
    expect(writes).toBeGreaterThan(0);
    expect(manifest.missingFiles).toEqual([]);
    expect(manifest.rowCounts.audit_event).toBeGreaterThan(0);
    const files = manifest.members.filter((m) => m.path.startsWith("files/"));
    expect(files.length).toBeGreaterThanOrEqual(3);

    try {
      const restored = await restoreBackup({
        file: out,
        ownerUrl: process.env.DATABASE_OWNER_URL!,
        database,
        store: { driver: "local", dir: restoreDir },
        replace: true,
      });
      expect(restored.rowCounts).toEqual(manifest.rowCounts);
      expect(restored.files).toBe(files.length);
      for (const member of files) {
        const key = member.path.slice("files/".length);
        expect(sha256sum(path.join(restoreDir, key))).toBe(member.sha256);
        // The stored files are never changed in place: the live copy hashes the same.
        expect(sha256sum(path.join(storeDir, key))).toBe(member.sha256);
      }
      // The restored records still verify (the chain head was dumped in the same snapshot).
      const url = new URL(process.env.DATABASE_OWNER_URL!);
      url.pathname = `/${database}`;
      const pool = new Pool({ connectionString: url.toString(), max: 1 });
      try {
        const report = await verifyAuditChain(drizzle({ client: pool }) as never);
        expect(report.firstBreak).toBeNull();
        expect(report.rows).toBe(manifest.rowCounts.audit_event);
      } finally {
        await pool.end();
      }
      console.log(
        `[backup] ${Object.values(manifest.rowCounts).reduce((a, b) => a + b, 0)} rows in ${Object.keys(manifest.rowCounts).length} tables, ` +
          `${files.length} files, ${fs.statSync(out).size} bytes; ${writes} writes ran during the backup`,
      );
    } finally {
      fs.rmSync(out, { force: true });
      fs.rmSync(restoreDir, { recursive: true, force: true });
      const admin = new URL(process.env.DATABASE_OWNER_URL!);
      admin.pathname = "/postgres";
      const pool = new Pool({ connectionString: admin.toString(), max: 1 });
      await pool.query(`DROP DATABASE IF EXISTS ${database} WITH (FORCE)`).finally(() => pool.end());
    }
  });

  it("refuses an archive whose contents do not match the manifest", { timeout: 60_000 }, async () => {
    const work = fs.mkdtempSync(path.join(os.tmpdir(), "benchclear-bad-"));
    const out = path.join(work, "b.tar");
    await createBackup({
      ownerUrl: process.env.DATABASE_OWNER_URL!,
      store: { driver: "local", dir: path.join(work, "none") },
      outFile: out,
    });
    // Flip one byte of the dump inside the archive.
    const x = path.join(work, "x");
    fs.mkdirSync(x);
    execFileSync("tar", ["-xf", out, "-C", x]);
    const dump = fs.readFileSync(path.join(x, "db.dump"));
    dump[dump.length - 10] ^= 0xff;
    fs.writeFileSync(path.join(x, "db.dump"), dump);
    execFileSync("tar", ["-cf", out, "-C", x, "manifest.json", "db.dump"]);
    await expect(
      restoreBackup({
        file: out,
        ownerUrl: process.env.DATABASE_OWNER_URL!,
        database: "benchclear_never_made",
        store: { driver: "local", dir: path.join(work, "store") },
      }),
    ).rejects.toThrow(/db\.dump does not match its SHA-256/);
    fs.rmSync(work, { recursive: true, force: true });
  });
});
