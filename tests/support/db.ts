// Test fixtures in the real test database (scripts/test.mjs creates it fresh and migrates it).
import crypto from "node:crypto";
import { drizzle } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import { getDb, schema, type Database } from "@/db";
import { and, eq } from "drizzle-orm";
import { decisions, departments, permits, users, type Role } from "@/db/schema";
import { decisionHmac } from "@/lib/records/seal";
import { hashPassword } from "@/lib/auth/password";

export const TEST_PASSWORD = "correct horse battery staple 42";
let passwordHash: Promise<string> | undefined;

export function requireDatabase(): void {
  if (!process.env.DATABASE_URL) {
    throw new Error("DATABASE_URL is not set: run the tests with `npm test`, which starts PostgreSQL.");
  }
}

let owner: { pool: Pool; db: Database } | undefined;

/**
 * A connection as the owner role (DATABASE_OWNER_URL), for fixtures the app's role may not write:
 * back-dating a permit's validity, for instance. The app code under test keeps using getDb(), which
 * connects as the app's role. Closed by tests/setup.ts after each file.
 */
export function ownerDb(): Database {
  if (!owner) {
    const url = process.env.DATABASE_OWNER_URL;
    if (!url) throw new Error("DATABASE_OWNER_URL is not set: run the tests with `npm test`.");
    const pool = new Pool({ connectionString: url, max: 2, application_name: "benchclear-test-owner" });
    pool.on("error", () => {});
    owner = { pool, db: drizzle({ client: pool, schema, casing: "snake_case" }) as Database };
  }
  return owner.db;
}

/**
 * Moves a permit's validity window for a test, as the owner, and re-dates and re-seals the approval
 * that granted it (the seal covers the validity; lib/records/seal.ts), so the records still verify.
 */
export async function redatePermit(permitId: string, window: { validFrom?: string; validTo?: string }): Promise<void> {
  const db = ownerDb();
  const [permit] = await db.update(permits).set(window).where(eq(permits.id, permitId)).returning();
  const [approval] = await db
    .select()
    .from(decisions)
    .where(and(eq(decisions.revisionId, permit.revisionId), eq(decisions.kind, "approve")));
  if (!approval) return;
  const next = { ...approval, validFrom: permit.validFrom, validTo: permit.validTo };
  await db
    .update(decisions)
    .set({ validFrom: next.validFrom, validTo: next.validTo, hmac: decisionHmac(next) })
    .where(eq(decisions.id, approval.id));
}

export async function closeOwnerDb(): Promise<void> {
  const current = owner;
  owner = undefined;
  await current?.pool.end();
}

export function uniq(prefix = "t"): string {
  return `${prefix}-${crypto.randomBytes(5).toString("hex")}`;
}

export async function createDepartment(name = uniq("Dept")) {
  const [row] = await getDb()
    .insert(departments)
    .values({ name, code: name.toUpperCase().slice(0, 12) })
    .returning();
  return row;
}

export async function createUser(options: {
  roles: Role[];
  departmentId?: string | null;
  name?: string;
  email?: string;
}) {
  passwordHash ??= hashPassword(TEST_PASSWORD);
  const tag = uniq(options.roles.join("+"));
  const [row] = await getDb()
    .insert(users)
    .values({
      email: options.email ?? `${tag}@example.test`,
      name: options.name ?? `Test ${tag}`,
      roles: options.roles,
      departmentId: options.departmentId ?? null,
      passwordHash: await passwordHash,
    })
    .returning();
  return row;
}

/** One user per role in one department, plus a second department for cross-department checks. */
export async function createRoleSet() {
  const dept = await createDepartment();
  const otherDept = await createDepartment();
  const [instructor, reviewer, officer, admin] = await Promise.all([
    createUser({ roles: ["instructor"], departmentId: dept.id }),
    createUser({ roles: ["reviewer"], departmentId: dept.id }),
    createUser({ roles: ["safety_officer"], departmentId: otherDept.id }),
    createUser({ roles: ["admin"], departmentId: otherDept.id }),
  ]);
  return { dept, otherDept, instructor, reviewer, safety_officer: officer, admin };
}
