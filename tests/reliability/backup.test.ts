import { execFileSync } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { drizzle } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { attachments } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { verifyAuditChain } from "@/lib/records/verify";
import { createBackup, restoreBackup } from "@/scripts/lib/backup";
// @ts-expect-error plain JavaScript helpers shared with the start and test scripts
import { startScratchCluster } from "@/scripts/lib/services.mjs";
import { createDepartment, requireDatabase, uniq } from "../support/db";
import { completeDraft, createDraft, pngBytes, saveDraft, signedInInstructor, upload } from "../applications/support";

requireDatabase();

// Issue 14, backups: `npm run backup` / `npm run restore` (scripts/lib/backup.ts). A backup taken
// while drafts are saved and audit rows written restores into a fresh PostgreSQL cluster (initdb'd
// for the test, on a port of its own) and a fresh file store with the row counts of the dump's
// snapshot and the SHA-256 of every stored file, and the restored audit chain still verifies. SHA-256 is checked with `sha256sum` (GNU coreutils), an
// implementation outside the project.

/** A port nobody listens on now (the OS picks it). */
async function freePort(): Promise<number> {
  const server = net.createServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as net.AddressInfo;
  await new Promise((resolve) => server.close(resolve));
  return port;
}

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
    const database = "benchclear_restored";

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
    // Every file this test's rows name is in the archive (the shared test database also holds rows
    // of other test files whose files live elsewhere, e.g. in the S3 test's bucket).
    const ours = await getDb()
      .select({ key: attachments.storageKey })
      .from(attachments)
      .where(eq(attachments.applicationId, draft.id));
    expect(ours.length).toBe(3);
    expect(manifest.missingFiles.filter((key) => ours.some((o) => o.key === key))).toEqual([]);
    expect(manifest.rowCounts.audit_event).toBeGreaterThan(0);
    const files = manifest.members.filter((m) => m.path.startsWith("files/"));
    expect(files.filter((m) => ours.some((o) => m.path === `files/${o.key}`)).length).toBe(3);

    const scratch = startScratchCluster({ port: await freePort(), password: uniq("scratch") }) as {
      url: (database: string) => string;
      stop: () => void;
    };
    try {
      const restored = await restoreBackup({
        file: out,
        ownerUrl: scratch.url(database),
        database,
        store: { driver: "local", dir: restoreDir },
      });
      expect(restored.rowCounts).toEqual(manifest.rowCounts);
      expect(restored.files).toBe(files.length);
      for (const member of files) {
        const key = member.path.slice("files/".length);
        expect(sha256sum(path.join(restoreDir, key))).toBe(member.sha256);
        // The stored files are never changed in place: the live copy hashes the same.
        expect(sha256sum(path.join(storeDir, key))).toBe(member.sha256);
      }
      // The restored records still verify (the chain head was dumped in the same snapshot), and the
      // app's role has the same grants there: no UPDATE on the audit trail.
      const pool = new Pool({ connectionString: scratch.url(database), max: 1 });
      try {
        const report = await verifyAuditChain(drizzle({ client: pool }) as never);
        expect(report.firstBreak).toBeNull();
        expect(report.rows).toBe(manifest.rowCounts.audit_event);
        const grants = await pool.query<{ update: boolean; insert: boolean }>(
          `SELECT has_table_privilege('benchclear_app', 'audit_event', 'UPDATE') AS update,
                  has_table_privilege('benchclear_app', 'audit_event', 'INSERT') AS insert`,
        );
        expect(grants.rows[0]).toEqual({ update: false, insert: true });
      } finally {
        await pool.end();
      }
      console.log(
        `[backup] ${Object.values(manifest.rowCounts).reduce((a, b) => a + b, 0)} rows in ${Object.keys(manifest.rowCounts).length} tables, ` +
          `${files.length} files, ${fs.statSync(out).size} bytes; ${writes} writes ran during the backup; restored into a fresh cluster`,
      );
    } finally {
      scratch.stop();
      fs.rmSync(out, { force: true });
      fs.rmSync(restoreDir, { recursive: true, force: true });
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
