import { eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, departments, users } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { createDepartment, createUser, ownerDb, requireDatabase, uniq } from "../support/db";

requireDatabase();

describe("database", () => {
  it("has every committed migration applied", async () => {
    // The migrations' own bookkeeping belongs to the owner; the app's role cannot read it.
    const rows = await ownerDb().execute(sql`SELECT count(*)::int AS n FROM drizzle.__drizzle_migrations`);
    const fs = await import("node:fs");
    const journal = JSON.parse(fs.readFileSync("db/migrations/meta/_journal.json", "utf8")) as { entries: unknown[] };
    expect(rows.rows[0].n).toBe(journal.entries.length);
  });

  it("round-trips a department and a user with several roles", async () => {
    const dept = await createDepartment(uniq("Round trip"));
    const user = await createUser({ roles: ["reviewer", "safety_officer"], departmentId: dept.id });
    const [back] = await getDb().select().from(users).where(eq(users.id, user.id));
    expect(back.roles).toEqual(["reviewer", "safety_officer"]);
    expect(back.departmentId).toBe(dept.id);
    expect(back.sessionVersion).toBe(1);
    expect(back.createdAt).toBeInstanceOf(Date);
    const [d] = await getDb().select().from(departments).where(eq(departments.id, dept.id));
    expect(d.name).toBe(dept.name);
  });

  it("refuses two users whose e-mails differ only in case", async () => {
    const email = `${uniq("case")}@example.test`;
    await createUser({ roles: ["instructor"], email });
    await expect(createUser({ roles: ["instructor"], email: email.toUpperCase() })).rejects.toThrow();
  });

  it("refuses a user without roles", async () => {
    await expect(createUser({ roles: [] })).rejects.toThrow();
  });

  describe("audit_event is append-only", () => {
    it("refuses UPDATE and DELETE, even for the table's owner", async () => {
      const id = uniq("entity");
      await writeAudit(getDb(), { actor: null, action: "test.append", entityType: "test", entityId: id });
      const [row] = await getDb().select().from(auditEvents).where(eq(auditEvents.entityId, id));
      expect(row.actorName).toBe("system");
      // drizzle wraps the PostgreSQL error; the trigger's message is on its cause.
      const refusal = async (query: Promise<unknown>) => {
        const error = await query.then(
          () => null,
          (e: Error & { cause?: Error }) => e,
        );
        return error?.cause?.message ?? error?.message ?? "no error";
      };
      // As the owner role: the app's role is refused earlier, by its grants (tests/db/roles.test.ts).
      expect(
        await refusal(ownerDb().update(auditEvents).set({ action: "test.forged" }).where(eq(auditEvents.id, row.id))),
      ).toMatch(/append-only: UPDATE refused/);
      expect(await refusal(ownerDb().delete(auditEvents).where(eq(auditEvents.id, row.id)))).toMatch(
        /append-only: DELETE refused/,
      );
      expect(await refusal(ownerDb().execute(sql`TRUNCATE audit_event`))).toMatch(/append-only: TRUNCATE refused/);
      const [still] = await getDb().select().from(auditEvents).where(eq(auditEvents.id, row.id));
      expect(still.action).toBe("test.append");
    });
  });
});
