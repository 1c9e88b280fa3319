import type { ApplicationState, Role } from "@/db/schema";
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

export function canReadApplication(
  user: ApplicationReader,
  row: Pick<ApplicationAccessRow, "applicantId" | "departmentId" | "submittedAt"> & { namedUserIds: readonly string[] },
): boolean {
  if (row.applicantId === user.id) return true;
  // Never submitted (a draft, or a draft withdrawn): the applicant's working copy only.
  if (row.submittedAt === null) return false;
  if (row.namedUserIds.includes(user.id)) return true;
  if (rolesHave(user.roles, "application.read.any")) return true;
  return (
    rolesHave(user.roles, "application.review") && user.departmentId !== null && row.departmentId === user.departmentId
  );
}

export function isApplicant(user: CurrentUser, row: Pick<ApplicationAccessRow, "applicantId">): boolean {
  return row.applicantId === user.id;
}
