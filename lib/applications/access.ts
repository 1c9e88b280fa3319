import { can, type CurrentUser } from "@/lib/auth/guards";
import type { ApplicationState } from "@/db/schema";

// Who may touch an application. The applicant owns it: only they edit, submit, withdraw and duplicate
// it. Once it has been submitted, it is also read by the people named on it, by reviewers of its
// department and by safety officers (application.read.any); before that, a draft is private.

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

export function canReadApplication(user: CurrentUser, row: ApplicationAccessRow): boolean {
  if (row.applicantId === user.id) return true;
  if (row.submittedAt === null) return false;
  if (row.namedUserIds.includes(user.id)) return true;
  if (can(user, "application.read.any")) return true;
  return can(user, "application.review") && user.departmentId !== null && row.departmentId === user.departmentId;
}

export function isApplicant(user: CurrentUser, row: Pick<ApplicationAccessRow, "applicantId">): boolean {
  return row.applicantId === user.id;
}
