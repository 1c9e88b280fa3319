import { and, eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents } from "@/db/schema";
import { decide } from "@/lib/review/decide";
import { ownerDb, requireDatabase, TEST_PASSWORD } from "../support/db";
import { asActor, createSubmittedApplication, createTeam } from "./support";

requireDatabase();

/** The message PostgreSQL refused with (drizzle wraps it; the trigger's text is on the cause). */
async function refusal(query: Promise<unknown>): Promise<string> {
  const error = await query.then(
    () => null,
    (e: Error & { cause?: Error }) => e,
  );
  return error?.cause?.message ?? error?.message ?? "no error";
}

describe("the audit rows of signed decisions are append-only", () => {
  it("refuses UPDATE and DELETE of an approval's audit row (migration 0001 trigger)", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 1 });
    await decide(asActor(team.reviewer), application.id, {
      kind: "approve",
      expectedVersion: application.version,
      password: TEST_PASSWORD,
      confirmedRequirements: [],
      extraConditions: [],
    });
    const [row] = await getDb()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, application.id), eq(auditEvents.action, "application.approved")));
    expect(row.actorName).toBe(team.reviewer.name);

    // The app's role has no UPDATE or DELETE on the table at all (migration 0008)…
    expect(
      await refusal(getDb().update(auditEvents).set({ actorName: "Someone else" }).where(eq(auditEvents.id, row.id))),
    ).toMatch(/permission denied for table audit_event/);
    expect(await refusal(getDb().delete(auditEvents).where(eq(auditEvents.id, row.id)))).toMatch(
      /permission denied for table audit_event/,
    );
    // …and even the owner, who has, is stopped by the trigger (migration 0001).
    expect(
      await refusal(ownerDb().update(auditEvents).set({ actorName: "Someone else" }).where(eq(auditEvents.id, row.id))),
    ).toMatch(/append-only: UPDATE refused/);
    expect(
      await refusal(
        ownerDb().execute(sql`UPDATE audit_event SET data = '{}'::jsonb WHERE entity_id = ${application.id}`),
      ),
    ).toMatch(/append-only: UPDATE refused/);
    expect(await refusal(ownerDb().delete(auditEvents).where(eq(auditEvents.id, row.id)))).toMatch(
      /append-only: DELETE refused/,
    );

    const [still] = await getDb().select().from(auditEvents).where(eq(auditEvents.id, row.id));
    expect(still).toEqual(row);
  });
});
