// Backups and restores (issue 14): one archive file (tar) holding
//   manifest.json   when, from which database, the row count of every table as of the dump's
//                   snapshot, and the size and SHA-256 of every other member;
//   db.dump         pg_dump's custom format, taken in one exported snapshot;
//   files/<key>     every stored file: uploads and rendered permit PDFs (local folder or S3 bucket).
// Consistency: the row counts are read in the same REPEATABLE READ snapshot that pg_dump dumps
// (pg_export_snapshot + pg_dump --snapshot), so a restore can be checked against them exactly, under
// load too. Files are copied after the snapshot: stored files are never changed in place, only added
// (before their row is written) or removed from drafts, so every file a dumped row names is there
// unless a draft's attachment was removed during the backup; the manifest lists any such key.
// Used by scripts/backup.ts, scripts/restore.ts and tests/reliability/backup.test.ts.
import { execFileSync, spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { Client } from "pg";

export type Manifest = {
  format: "benchclear-backup-1";
  createdAt: string;
  database: string;
  serverVersion: string;
  storage: { driver: "local" | "s3"; location: string };
  rowCounts: Record<string, number>;
  members: { path: string; size_B: number; sha256: string }[];
  missingFiles: string[];
};

export type StoreConfig =
  | { driver: "local"; dir: string }
  | {
      driver: "s3";
      bucket: string;
      region: string;
      endpoint?: string;
      accessKeyId?: string;
      secretAccessKey?: string;
      forcePathStyle?: boolean;
    };

/** PostgreSQL's client programs: PG_BIN_DIR, else the newest Debian install, else the PATH. */
export function pgBin(name: string): string {
  if (process.env.PG_BIN_DIR) return path.join(process.env.PG_BIN_DIR, name);
  const base = "/usr/lib/postgresql";
  if (fs.existsSync(base)) {
    const versions = fs
      .readdirSync(base)
      .filter((v) => fs.existsSync(path.join(base, v, "bin", name)))
      .sort((a, b) => Number(b) - Number(a));
    if (versions.length) return path.join(base, versions[0], "bin", name);
  }
  return name;
}

function sha256File(file: string): string {
  return crypto.createHash("sha256").update(fs.readFileSync(file)).digest("hex");
}

function walkFiles(dir: string, prefix = ""): string[] {
  if (!fs.existsSync(dir)) return [];
  const out: string[] = [];
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const rel = prefix ? `${prefix}/${entry.name}` : entry.name;
    if (entry.isDirectory()) out.push(...walkFiles(path.join(dir, entry.name), rel));
    else if (entry.isFile() && !entry.name.endsWith(".tmp")) out.push(rel);
  }
  return out.sort();
}

async function s3Client(store: Extract<StoreConfig, { driver: "s3" }>) {
  const { S3Client } = await import("@aws-sdk/client-s3");
  return new S3Client({
    region: store.region,
    endpoint: store.endpoint,
    forcePathStyle: store.forcePathStyle,
    credentials:
      store.accessKeyId && store.secretAccessKey
        ? { accessKeyId: store.accessKeyId, secretAccessKey: store.secretAccessKey }
        : undefined,
  });
}

/** Copies every stored file into `into/<key>`; returns the keys. */
async function pullStore(store: StoreConfig, into: string): Promise<string[]> {
  if (store.driver === "local") {
    const keys = walkFiles(store.dir);
    for (const key of keys) {
      fs.mkdirSync(path.dirname(path.join(into, key)), { recursive: true });
      fs.copyFileSync(path.join(store.dir, key), path.join(into, key));
    }
    return keys;
  }
  const { GetObjectCommand, ListObjectsV2Command } = await import("@aws-sdk/client-s3");
  const client = await s3Client(store);
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const page = await client.send(new ListObjectsV2Command({ Bucket: store.bucket, ContinuationToken: token }));
    for (const object of page.Contents ?? []) {
      if (!object.Key) continue;
      const res = await client.send(new GetObjectCommand({ Bucket: store.bucket, Key: object.Key }));
      const bytes = Buffer.from(await res.Body!.transformToByteArray());
      fs.mkdirSync(path.dirname(path.join(into, object.Key)), { recursive: true });
      fs.writeFileSync(path.join(into, object.Key), bytes);
      keys.push(object.Key);
    }
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return keys.sort();
}

async function pushStore(store: StoreConfig, from: string, keys: string[]): Promise<void> {
  if (store.driver === "local") {
    for (const key of keys) {
      const target = path.join(store.dir, key);
      fs.mkdirSync(path.dirname(target), { recursive: true });
      fs.copyFileSync(path.join(from, key), target);
    }
    return;
  }
  const { PutObjectCommand } = await import("@aws-sdk/client-s3");
  const client = await s3Client(store);
  for (const key of keys) {
    await client.send(
      new PutObjectCommand({ Bucket: store.bucket, Key: key, Body: fs.readFileSync(path.join(from, key)) }),
    );
  }
}

function databaseName(url: string): string {
  return decodeURIComponent(new URL(url).pathname.replace(/^\//, ""));
}

function pgEnv(url: string): NodeJS.ProcessEnv {
  // Passed to pg_dump / pg_restore through the environment, so no password is on a command line.
  const u = new URL(url);
  return {
    ...process.env,
    PGHOST: u.hostname,
    PGPORT: u.port || "5432",
    PGUSER: decodeURIComponent(u.username),
    PGPASSWORD: decodeURIComponent(u.password),
    PGDATABASE: databaseName(url),
  };
}

async function countRows(client: Client): Promise<Record<string, number>> {
  const tables = await client.query<{ name: string }>(
    `SELECT tablename AS name FROM pg_tables WHERE schemaname = 'public' ORDER BY tablename`,
  );
  const counts: Record<string, number> = {};
  for (const { name } of tables.rows) {
    const res = await client.query<{ n: string }>(`SELECT count(*) AS n FROM public."${name.replace(/"/g, '""')}"`);
    counts[name] = Number(res.rows[0].n);
  }
  return counts;
}

/** Writes one backup archive to `outFile` (written aside and renamed into place when complete). */
export async function createBackup(options: {
  ownerUrl: string;
  store: StoreConfig;
  outFile: string;
}): Promise<Manifest> {
  const work = fs.mkdtempSync(path.join(os.tmpdir(), "benchclear-backup-"));
  const client = new Client({ connectionString: options.ownerUrl, application_name: "benchclear-backup" });
  await client.connect();
  try {
    await client.query("BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY");
    const snapshot = (await client.query<{ id: string }>("SELECT pg_export_snapshot() AS id")).rows[0].id;
    const rowCounts = await countRows(client);
    const serverVersion = (await client.query<{ v: string }>("SHOW server_version")).rows[0].v;
    const referenced = await client.query<{ key: string }>(
      `SELECT storage_key AS key FROM attachment UNION SELECT pdf_key FROM permit WHERE pdf_key IS NOT NULL`,
    );
    const dump = spawnSync(
      pgBin("pg_dump"),
      ["--format=custom", "--no-owner", `--snapshot=${snapshot}`, `--file=${path.join(work, "db.dump")}`],
      { env: pgEnv(options.ownerUrl), encoding: "utf8" },
    );
    if (dump.status !== 0) throw new Error(`pg_dump failed: ${dump.stderr || dump.error?.message}`);
    await client.query("COMMIT");

    const keys = await pullStore(options.store, path.join(work, "files"));
    const have = new Set(keys);
    const members = ["db.dump", ...keys.map((k) => `files/${k}`)].map((rel) => ({
      path: rel,
      size_B: fs.statSync(path.join(work, rel)).size,
      sha256: sha256File(path.join(work, rel)),
    }));
    const manifest: Manifest = {
      format: "benchclear-backup-1",
      createdAt: new Date().toISOString(),
      database: databaseName(options.ownerUrl),
      serverVersion,
      storage:
        options.store.driver === "local"
          ? { driver: "local", location: options.store.dir }
          : { driver: "s3", location: options.store.bucket },
      rowCounts,
      members,
      missingFiles: referenced.rows.map((r) => r.key).filter((k) => !have.has(k)),
    };
    fs.writeFileSync(path.join(work, "manifest.json"), JSON.stringify(manifest, null, 2) + "\n");

    fs.mkdirSync(path.dirname(path.resolve(options.outFile)), { recursive: true });
    const partial = `${options.outFile}.partial`;
    execFileSync("tar", ["-cf", partial, "-C", work, "manifest.json", "db.dump", ...(keys.length ? ["files"] : [])]);
    fs.renameSync(partial, options.outFile);
    return manifest;
  } finally {
    await client.end().catch(() => undefined);
    fs.rmSync(work, { recursive: true, force: true });
  }
}

export class RestoreError extends Error {}

/** The app's database role (scripts/lib/migrate.ts APP_ROLE; the dump's grants name it). */
const APP_ROLE = "benchclear_app";

/**
 * Rebuilds a fresh database and file store from an archive: unpacks it, checks every member against
 * the manifest's SHA-256, creates `database` (refused when it exists, unless `replace`), restores the
 * dump into it as the owner, copies the files into the store (refused when the store is not empty),
 * then compares each table's row count and each stored file's hash with the manifest.
 */
export async function restoreBackup(options: {
  file: string;
  ownerUrl: string;
  database: string;
  store: StoreConfig;
  replace?: boolean;
  log?: (line: string) => void;
}): Promise<{ manifest: Manifest; rowCounts: Record<string, number>; files: number }> {
  const log = options.log ?? (() => {});
  if (!/^[a-z_][a-z0-9_]{0,62}$/.test(options.database)) {
    throw new RestoreError("The database name must be a plain lower-case identifier.");
  }
  const work = fs.mkdtempSync(path.join(os.tmpdir(), "benchclear-restore-"));
  try {
    execFileSync("tar", ["-xf", path.resolve(options.file), "-C", work]);
    const manifest = JSON.parse(fs.readFileSync(path.join(work, "manifest.json"), "utf8")) as Manifest;
    if (manifest.format !== "benchclear-backup-1") throw new RestoreError("Not a Benchclear backup archive.");
    for (const member of manifest.members) {
      const full = path.join(work, member.path);
      if (!fs.existsSync(full)) throw new RestoreError(`The archive is missing ${member.path}.`);
      if (sha256File(full) !== member.sha256)
        throw new RestoreError(`${member.path} does not match its SHA-256 in the manifest.`);
    }
    log(`  archive checked: ${manifest.members.length} members match the manifest`);

    const keys = manifest.members.filter((m) => m.path.startsWith("files/")).map((m) => m.path.slice("files/".length));
    if (options.store.driver === "local" && walkFiles(options.store.dir).length > 0) {
      throw new RestoreError(`The file store ${options.store.dir} is not empty; restore into a fresh one.`);
    }

    const admin = new URL(options.ownerUrl);
    admin.pathname = "/postgres";
    const maintenance = new Client({ connectionString: admin.toString(), application_name: "benchclear-restore" });
    await maintenance.connect();
    try {
      const exists = await maintenance.query("SELECT 1 FROM pg_database WHERE datname = $1", [options.database]);
      if (exists.rowCount && !options.replace) {
        throw new RestoreError(`The database ${options.database} exists; restore into a new one (or pass --replace).`);
      }
      if (exists.rowCount) await maintenance.query(`DROP DATABASE ${options.database} WITH (FORCE)`);
      await maintenance.query(`CREATE DATABASE ${options.database}`);
      // Roles belong to the cluster, not to the dump, whose grants name the app's role: on a fresh
      // cluster it is made here without LOGIN, as migration 0008 makes it; the DBA then gives it LOGIN
      // and a password (README, Backups).
      await maintenance.query(`DO $$
        BEGIN
          IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '${APP_ROLE}') THEN
            CREATE ROLE ${APP_ROLE} NOLOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOINHERIT;
          END IF;
        END $$`);
    } finally {
      await maintenance.end();
    }
    const target = new URL(options.ownerUrl);
    target.pathname = `/${options.database}`;
    const restore = spawnSync(
      pgBin("pg_restore"),
      ["--exit-on-error", "--no-owner", `--dbname=${options.database}`, path.join(work, "db.dump")],
      { env: pgEnv(target.toString()), encoding: "utf8" },
    );
    if (restore.status !== 0) throw new RestoreError(`pg_restore failed: ${restore.stderr || restore.error?.message}`);
    log(`  database ${options.database} restored`);

    await pushStore(options.store, path.join(work, "files"), keys);
    if (options.store.driver === "local") {
      const want = new Map(manifest.members.map((m) => [m.path, m.sha256]));
      for (const key of keys) {
        if (sha256File(path.join(options.store.dir, key)) !== want.get(`files/${key}`)) {
          throw new RestoreError(`The restored file ${key} does not match its SHA-256.`);
        }
      }
    }
    log(`  ${keys.length} stored files restored and checked`);

    const client = new Client({ connectionString: target.toString(), application_name: "benchclear-restore" });
    await client.connect();
    let rowCounts: Record<string, number>;
    try {
      rowCounts = await countRows(client);
    } finally {
      await client.end();
    }
    const differ = Object.keys({ ...manifest.rowCounts, ...rowCounts }).filter(
      (t) => manifest.rowCounts[t] !== rowCounts[t],
    );
    if (differ.length) {
      throw new RestoreError(
        `Row counts differ from the backup's: ${differ.map((t) => `${t} ${rowCounts[t]} ≠ ${manifest.rowCounts[t]}`).join(", ")}.`,
      );
    }
    log(`  row counts match the backup for ${Object.keys(rowCounts).length} tables`);
    return { manifest, rowCounts, files: keys.length };
  } finally {
    fs.rmSync(work, { recursive: true, force: true });
  }
}

/** The file store as the environment configures it (STORAGE_DRIVER, STORAGE_DIR, S3_*). */
export function storeFromEnv(env: NodeJS.ProcessEnv, overrideDir?: string): StoreConfig {
  if (env.STORAGE_DRIVER === "s3" && !overrideDir) {
    if (!env.S3_BUCKET) throw new Error("S3_BUCKET is required when STORAGE_DRIVER=s3");
    return {
      driver: "s3",
      bucket: env.S3_BUCKET,
      region: env.S3_REGION ?? "us-east-1",
      endpoint: env.S3_ENDPOINT || undefined,
      accessKeyId: env.S3_ACCESS_KEY_ID || undefined,
      secretAccessKey: env.S3_SECRET_ACCESS_KEY || undefined,
      forcePathStyle: env.S3_FORCE_PATH_STYLE === "true" || env.S3_FORCE_PATH_STYLE === "1",
    };
  }
  return { driver: "local", dir: path.resolve(overrideDir ?? env.STORAGE_DIR ?? ".data/uploads") };
}
