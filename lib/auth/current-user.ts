import { users, type Role } from "@/db/schema";

// Who is acting: the one set of user columns every actor carries (the signed-in user in
// lib/auth/guards.ts, the demo story's actors, test fixtures). Never the password hash.

export type CurrentUser = {
  id: string;
  email: string;
  name: string;
  roles: Role[];
  departmentId: string | null;
};

/** The columns of a CurrentUser, for `db.select(currentUserColumns)`. */
export const currentUserColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  roles: users.roles,
  departmentId: users.departmentId,
};
