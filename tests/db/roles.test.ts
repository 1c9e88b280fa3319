import { eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applicationRevisions, auditEvents, decisions, permits } from "@/db/schema";
import { decide } from "@/lib/review/decide";
import { ownerDb, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { asActor, createSubmittedApplication, createTeam } from "../review/support";

requireDatabase();

// Issue 14, database roles: the code under test connects as benchclear_app (scripts/test.mjs), the
// migrations as the owner. The app's role may add to the records but never change or remove them,
// nor change the tables or their triggers. Before migration 0008 every statement below succeeded
// (the app was the owner, locally the cluster's superuser).

async function refusal(query: Promise<unknown>): Promise<string> {
  const error = await query.then(
    () => null,
    (e: Error & { cause?: Error }) => e,
  );
  return error?.cause?.message ?? error?.message ?? "no error";
}

async function approvedPermit() {
  const team = await createTeam();
  const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 1 });
  const result = await decide(asActor(team.reviewer), application.id, {
    kind: "approve",
    expectedVersion: application.version,
    password: TEST_PASSWORD,
    confirmedRequirements: [],
    extraConditions: [],
  });
  return result.permit!;
}

describe("the app's database role", () => {
  it("is not the owner and not a superuser", async () => {
    const [me] = (
      await getDb().execute<{ user: string; superuser: boolean; creates: boolean }>(
        sql`SELECT current_user AS user, rolsuper AS superuser, rolcreaterole OR rolcreatedb AS creates
              FROM pg_roles WHERE rolname = current_user`,
      )
    ).rows;
    expect(me).toEqual({ user: "benchclear_app", superuser: false, creates: false });
    const owners = await getDb().execute<{ owner: string }>(
      sql`SELECT DISTINCT tableowner AS owner FROM pg_tables WHERE schemaname = 'public'`,
    );
    expect(owners.rows.map((r) => r.owner)).not.toContain("benchclear_app");
  });

  it("cannot UPDATE, DELETE or TRUNCATE audit_event, decision or application_revision", async () => {
    const permit = await approvedPermit();
    const db = getDb();
    const column = { audit_event: "action", decision: "comment", application_revision: "tier" };
    for (const table of ["audit_event", "decision", "application_revision"] as const) {
      expect(
        await refusal(db.execute(sql.raw(`UPDATE ${table} SET ${column[table]} = ${column[table]} WHERE false`))),
      ).toMatch(new RegExp(`permission denied for table ${table}`));
      expect(await refusal(db.execute(sql.raw(`DELETE FROM ${table} WHERE false`)))).toMatch(
        new RegExp(`permission denied for table ${table}`),
      );
      expect(await refusal(db.execute(sql.raw(`TRUNCATE ${table} CASCADE`)))).toMatch(
        new RegExp(`permission denied for table ${table}`),
      );
    }
    expect(
      await refusal(
        db.update(decisions).set({ signerName: "Someone else" }).where(eq(decisions.revisionId, permit.revisionId)),
      ),
    ).toMatch(/permission denied for table decision/);
    expect(
      await refusal(
        db.update(applicationRevisions).set({ tier: 0 }).where(eq(applicationRevisions.id, permit.revisionId)),
      ),
    ).toMatch(/permission denied for table application_revision/);
  });

  it("cannot disable the append-only trigger, alter or drop the tables", async () => {
    const db = getDb();
    for (const statement of [
      "ALTER TABLE audit_event DISABLE TRIGGER audit_event_no_update_delete",
      "ALTER TABLE audit_event DISABLE TRIGGER ALL",
      "ALTER TABLE audit_event DROP COLUMN hash",
      "ALTER TABLE decision ADD COLUMN forged text",
      "DROP TRIGGER audit_event_chain ON audit_event",
      "DROP TABLE application_revision",
      "CREATE TABLE forged (id int)",
    ]) {
      expect(await refusal(db.execute(sql.raw(statement))), statement).toMatch(/must be owner|permission denied/);
    }
    expect(await refusal(db.execute(sql`UPDATE audit_chain_head SET seq = 0`))).toMatch(/permission denied/);
  });

  it("may change a permit's state columns but not what the permit says", async () => {
    const permit = await approvedPermit();
    const db = getDb();
    for (const set of [
      { validTo: "2099-12-31" },
      { validFrom: "2000-01-01" },
      { conditions: [] as string[] },
      { holderId: permit.holderId },
      { number: uniq("N") },
      { verificationCode: uniq("code") },
      { tier: 4 },
    ]) {
      expect(await refusal(db.update(permits).set(set).where(eq(permits.id, permit.id))), JSON.stringify(set)).toMatch(
        /permission denied for table permit/,
      );
    }
    expect(await refusal(db.delete(permits).where(eq(permits.id, permit.id)))).toMatch(/permission denied/);
    // The columns that do change after issue (lib/review/actions.ts revoke, lib/pdf/store.ts).
    const [updated] = await db
      .update(permits)
      .set({ pdfRenderedState: null, version: sql`${permits.version}`, updatedAt: new Date() })
      .where(eq(permits.id, permit.id))
      .returning({ id: permits.id });
    expect(updated.id).toBe(permit.id);
  });

  it("gets the app grants on a table the owner adds later (default privileges)", async () => {
    const table = `later_${uniq("t").replace(/-/g, "_")}`;
    await ownerDb().execute(sql.raw(`CREATE TABLE ${table} (id serial PRIMARY KEY, note text)`));
    try {
      await getDb().execute(sql.raw(`INSERT INTO ${table} (note) VALUES ('a')`));
      await getDb().execute(sql.raw(`UPDATE ${table} SET note = 'b'`));
      const rows = await getDb().execute<{ note: string }>(sql.raw(`SELECT note FROM ${table}`));
      expect(rows.rows).toEqual([{ note: "b" }]);
      await getDb().execute(sql.raw(`DELETE FROM ${table}`));
    } finally {
      await ownerDb().execute(sql.raw(`DROP TABLE ${table}`));
    }
  });

  it("still writes audit rows (INSERT and SELECT are granted)", async () => {
    const id = uniq("entity");
    await getDb()
      .insert(auditEvents)
      .values({ actorName: "system", action: "test.roles", entityType: "test", entityId: id });
    const [row] = await getDb().select().from(auditEvents).where(eq(auditEvents.entityId, id));
    expect(row.chainSeq).toBeGreaterThan(0);
    expect(row.hash).toMatch(/^[0-9a-f]{64}$/);
  });
});
