// Who may read an application (record-level, on top of the permission table): its applicant, and once
// submitted the people named on it, reviewers of its department and safety officers. Pure, so pages,
// handlers and actions apply the same rule.

import type { Role } from "@/db/schema";
import { rolesHave } from "@/lib/auth/permissions";

export type Reader = { id: string; roles: readonly Role[]; departmentId: string | null };

export function canReadApplication(
  user: Reader,
  application: { applicantId: string; namedUserIds: readonly string[]; departmentId: string; state?: string },
): boolean {
  if (application.applicantId === user.id) return true;
  // A draft is the applicant's working copy until it is submitted (as in lib/applications/access.ts).
  if (application.state === "draft") return false;
  if (application.namedUserIds.includes(user.id)) return true;
  if (rolesHave(user.roles, "application.read.any")) return true;
  return (
    rolesHave(user.roles, "application.review") &&
    user.departmentId !== null &&
    user.departmentId === application.departmentId
  );
}
