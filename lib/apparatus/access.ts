import { can, type CurrentUser } from "@/lib/auth/guards";

// Who may touch an apparatus record. The registry is shared within a department: apparatus is read by
// its owner, by anyone in its department (reviewers see what their instructors run) and by safety
// officers everywhere (application.read.any); it is edited by its owner and by anyone in its
// department who holds apparatus.write (a technician may update the bench a lecturer registered).
// Every edit is a new revision with the editor's name, so shared editing loses nothing.

export type ApparatusOwnership = { ownerId: string; departmentId: string };

export function canReadApparatus(user: CurrentUser, record: ApparatusOwnership): boolean {
  if (!can(user, "apparatus.read")) return false;
  if (record.ownerId === user.id) return true;
  if (user.departmentId !== null && record.departmentId === user.departmentId) return true;
  return can(user, "application.read.any");
}

export function canWriteApparatus(user: CurrentUser, record: ApparatusOwnership): boolean {
  if (!can(user, "apparatus.write")) return false;
  return record.ownerId === user.id || (user.departmentId !== null && record.departmentId === user.departmentId);
}
