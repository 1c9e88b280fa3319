import "server-only";
import { eq } from "drizzle-orm";
import { applicationRevisions, applications, permits } from "@/db/schema";
import type { CurrentUser } from "@/lib/auth/guards";
import type { DbOrTx } from "@/lib/audit";
import { notFound } from "@/lib/errors";

// A permit its holder is about to start something from (a renewal, an amendment), read with its
// application and approved revision and locked FOR UPDATE until the transaction ends: two clicks of
// the same button queue here, and the second then finds what the first created. Anyone but the
// holder learns nothing about the permit (404).

export async function lockHeldPermit(tx: DbOrTx, actor: CurrentUser, permitId: string) {
  const [row] = await tx
    .select({
      permit: {
        id: permits.id,
        number: permits.number,
        state: permits.state,
        validTo: permits.validTo,
        holderId: permits.holderId,
        version: permits.version,
        renewedByApplicationId: permits.renewedByApplicationId,
      },
      application: {
        id: applications.id,
        title: applications.title,
        departmentId: applications.departmentId,
        namedUserIds: applications.namedUserIds,
        apparatusId: applications.apparatusId,
        apparatusRevisionId: applications.apparatusRevisionId,
      },
      content: applicationRevisions.content,
      tier: applicationRevisions.tier,
    })
    .from(permits)
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
    .where(eq(permits.id, permitId))
    .for("update", { of: permits });
  if (!row || row.permit.holderId !== actor.id) throw notFound("That permit");
  return row;
}
