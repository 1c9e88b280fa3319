import "server-only";
import { eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { apparatus, apparatusRevisions } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import type { Tx } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { assessSetup, type Assessment, type SetupInput } from "@/lib/hazard";
import { currentTierRules } from "@/lib/hazard-rules";
import { AppError, conflict, forbidden, notFound } from "@/lib/errors";
import type { ApparatusCreateInput, ApparatusUpdateInput } from "@/lib/apparatus/schemas";
import { canReadApparatus, canWriteApparatus } from "./access";

// Writes to the apparatus registry. A record is never edited in place: every change inserts a new
// revision with its own assessment (under the tier rules in force) and moves the record's pointer.

function needDepartment(user: CurrentUser): string {
  if (!user.departmentId) {
    throw new AppError("forbidden", "Your account has no department yet. Ask an admin to set it, then try again.");
  }
  return user.departmentId;
}

export async function createApparatus(user: CurrentUser, input: ApparatusCreateInput) {
  assertCan(user, "apparatus.write");
  const departmentId = needDepartment(user);
  const assessment = assessSetup(input.setup, await currentTierRules());
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(apparatus)
      .values({
        name: input.name,
        room: input.room,
        notes: input.notes,
        departmentId,
        ownerId: user.id,
        currentRevision: 1,
        tier: assessment.tier,
        energy_J: assessment.energy_J,
      })
      .returning({ id: apparatus.id });
    const [revision] = await tx
      .insert(apparatusRevisions)
      .values({
        apparatusId: row.id,
        revision: 1,
        name: input.name,
        room: input.room,
        notes: input.notes,
        setup: input.setup,
        assessment,
        tier: assessment.tier,
        createdById: user.id,
      })
      .returning({ id: apparatusRevisions.id });
    await writeAudit(tx, {
      actor: user,
      action: "apparatus.created",
      entityType: "apparatus",
      entityId: row.id,
      data: { revision: 1, revisionId: revision.id, tier: assessment.tier },
    });
    return { id: row.id, revision: 1, revisionId: revision.id, tier: assessment.tier };
  });
}

/** A revision just written, as handed to `inTransaction` before its transaction commits. */
export type SavedApparatusRevision = {
  id: string;
  revision: number;
  revisionId: string;
  name: string;
  room: string;
  notes: string;
  setup: SetupInput;
  assessment: Assessment;
};

export type UpdateApparatusOptions = {
  /**
   * Runs inside the revision's transaction, after the revision and its audit row: what other domains
   * record about the change (lib/rereview flags the permits that cover the apparatus) commits or
   * rolls back with it. The registry itself knows nothing of permits.
   */
  inTransaction?: (tx: Tx, saved: SavedApparatusRevision) => Promise<void>;
};

export async function updateApparatus(
  user: CurrentUser,
  id: string,
  input: ApparatusUpdateInput,
  options: UpdateApparatusOptions = {},
) {
  assertCan(user, "apparatus.write");
  const assessment = assessSetup(input.setup, await currentTierRules());
  return db.transaction(async (tx) => {
    // Locked, so two editors starting from the same revision cannot both write the next one.
    const [row] = await tx
      .select({
        id: apparatus.id,
        ownerId: apparatus.ownerId,
        departmentId: apparatus.departmentId,
        currentRevision: apparatus.currentRevision,
        archivedAt: apparatus.archivedAt,
        retiredAt: apparatus.retiredAt,
      })
      .from(apparatus)
      .where(eq(apparatus.id, id))
      .for("update");
    if (!row || !canReadApparatus(user, row)) throw notFound("That apparatus");
    if (!canWriteApparatus(user, row))
      throw forbidden("Only the owner and people of its department may edit this apparatus.");
    if (row.archivedAt) throw conflict("This apparatus is archived and can no longer be edited.");
    if (row.retiredAt) throw conflict("This apparatus is retired and can no longer be edited.");
    if (row.currentRevision !== input.expectedRevision) {
      throw conflict(
        `Someone saved revision ${row.currentRevision} while you were editing revision ${input.expectedRevision}. Reload it and apply your changes again.`,
      );
    }
    const next = row.currentRevision + 1;
    const [revision] = await tx
      .insert(apparatusRevisions)
      .values({
        apparatusId: id,
        revision: next,
        name: input.name,
        room: input.room,
        notes: input.notes,
        setup: input.setup,
        assessment,
        tier: assessment.tier,
        createdById: user.id,
      })
      .returning({ id: apparatusRevisions.id });
    await tx
      .update(apparatus)
      .set({
        name: input.name,
        room: input.room,
        notes: input.notes,
        currentRevision: next,
        tier: assessment.tier,
        energy_J: assessment.energy_J,
        updatedAt: sql`now()`,
      })
      .where(eq(apparatus.id, id));
    await writeAudit(tx, {
      actor: user,
      action: "apparatus.revised",
      entityType: "apparatus",
      entityId: id,
      data: { revision: next, revisionId: revision.id, tier: assessment.tier },
    });
    await options.inTransaction?.(tx, {
      id,
      revision: next,
      revisionId: revision.id,
      name: input.name,
      room: input.room,
      notes: input.notes,
      setup: input.setup,
      assessment,
    });
    return { id, revision: next, revisionId: revision.id, tier: assessment.tier };
  });
}
