import "server-only";
import { eq } from "drizzle-orm";
import type { PgSelect } from "drizzle-orm/pg-core";
import { applicationRevisions, applications, permits, users } from "@/db/schema";

// The permit base query, written once: a permit with its application, the signed revision it was
// issued from (its content and assessment) and its holder. Callers choose the columns, start from
// `.from(permits).$dynamic()` and add their own joins, filters and locks.

export function joinPermitBase<T extends PgSelect>(query: T) {
  return query
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
    .innerJoin(users, eq(users.id, permits.holderId));
}
