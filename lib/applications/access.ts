import { and, eq, isNotNull, or, sql, type SQL } from "drizzle-orm";
import { applications, type ApplicationState, type Role } from "@/db/schema";
import type { CurrentUser } from "@/lib/auth/guards";
import { rolesHave } from "@/lib/auth/permissions";

// Who may touch an application. The applicant owns it: only they edit, submit, withdraw and duplicate
// it. Once it has been submitted, it is also read by the people named on it, by reviewers of its
// department and by safety officers (application.read.any); before that, a draft is private. The
// form, the review screens and the decisions all apply this one rule.

export type ApplicationAccessRow = {
  applicantId: string;
  departmentId: string;
  namedUserIds: string[];
  submittedAt: Date | null;
  state: ApplicationState;
};

export const EDITABLE_STATES = ["draft", "returned"] as const satisfies readonly ApplicationState[];
export const WITHDRAWABLE_STATES = [
  "draft",
  "submitted",
  "in_review",
  "returned",
] as const satisfies readonly ApplicationState[];

export function isEditable(state: ApplicationState): boolean {
  return (EDITABLE_STATES as readonly ApplicationState[]).includes(state);
}

export type ApplicationReader = { id: string; roles: readonly Role[]; departmentId: string | null };

/** What a user's permissions let them read beyond their own and named applications. */
function readGrants(user: ApplicationReader): { any: boolean; reviewDepartmentId: string | null } {
  return {
    any: rolesHave(user.roles, "application.read.any"),
    reviewDepartmentId: rolesHave(user.roles, "application.review") ? user.departmentId : null,
  };
}

export function canReadApplication(
  user: ApplicationReader,
  row: Pick<ApplicationAccessRow, "applicantId" | "departmentId" | "submittedAt"> & { namedUserIds: readonly string[] },
): boolean {
  if (row.applicantId === user.id) return true;
  // Never submitted (a draft, or a draft withdrawn): the applicant's working copy only.
  if (row.submittedAt === null) return false;
  if (row.namedUserIds.includes(user.id)) return true;
  const grants = readGrants(user);
  if (grants.any) return true;
  return grants.reviewDepartmentId !== null && row.departmentId === grants.reviewDepartmentId;
}

/**
 * canReadApplication as a WHERE condition, for lists and search (the same grants, so the two cannot
 * drift; tests/search checks them against each other). Callers still pass each row through
 * canReadApplication. Never undefined: the user is required first.
 */
export function applicationReadScope(user: ApplicationReader): SQL {
  const grants = readGrants(user);
  const others: SQL[] = [sql`${user.id}::uuid = ANY(${applications.namedUserIds})`];
  if (grants.any) others.push(sql`true`);
  if (grants.reviewDepartmentId !== null) others.push(eq(applications.departmentId, grants.reviewDepartmentId));
  return or(eq(applications.applicantId, user.id), and(isNotNull(applications.submittedAt), or(...others)))!;
}

export function isApplicant(user: CurrentUser, row: Pick<ApplicationAccessRow, "applicantId">): boolean {
  return row.applicantId === user.id;
}
