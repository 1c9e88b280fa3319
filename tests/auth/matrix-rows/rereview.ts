import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { permits, users } from "@/db/schema";
import { createApparatus } from "@/lib/apparatus/actions";
import { reviseApparatus } from "@/lib/rereview/actions";
import { asActor, createSubmittedApplication, TIER_SETUPS } from "../../review/support";
import type { MatrixContext, MatrixRow } from "../matrix-kit";

// Re-review when an apparatus changes (issue 17, item 4): starting an amendment of a permit whose
// apparatus changed since approval.

/** A self-certified tier-0 permit held by the matrix instructor over an apparatus since edited. */
async function changedPermitOfInstructor(ctx: MatrixContext) {
  const [holder] = await getDb().select().from(users).where(eq(users.id, ctx.users.instructor.id));
  const actor = asActor(holder);
  const name = `Matrix bench ${ctx.unique}`;
  const created = await createApparatus(actor, { name, room: "B12", notes: "", setup: TIER_SETUPS[0] });
  const { application } = await createSubmittedApplication({
    applicant: holder,
    tier: 0,
    apparatus: { id: created.id, revisionId: created.revisionId, name },
  });
  await reviseApparatus(actor, created.id, {
    name,
    room: "B12",
    notes: "",
    setup: TIER_SETUPS[1],
    expectedRevision: 1,
  });
  const [permit] = await getDb()
    .select({ id: permits.id })
    .from(permits)
    .where(eq(permits.applicationId, application.id));
  return { id: permit.id };
}

export const REREVIEW_ROWS: MatrixRow[] = [
  {
    route: "/api/permits/[id]/amend",
    method: "POST",
    prepare: changedPermitOfInstructor,
    path: (c) => `/api/permits/${c.data.id}/amend`,
    body: () => ({}),
    // Only the holder amends; others who may create applications learn nothing about the permit.
    expect: { anonymous: 401, instructor: 201, reviewer: 404, safety_officer: 404, admin: 403 },
  },
];
