// The roles a person may hold, the one list: the database's `role` enum (db/schema/users.ts), the
// request schemas (lib/auth/schemas.ts), the admin forms and every label derive from it. What a role
// may do is the permission table's business (lib/auth/permissions.ts): code asks for a permission,
// never a role. Pure and browser-safe: client components import it.

// `responder`: an emergency responder's account (fire service, campus security). It sees the live
// high-voltage sheet and nothing else: it holds no "workspace.use" (lib/auth/permissions.ts).
export const ROLES = ["instructor", "reviewer", "safety_officer", "admin", "responder"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  instructor: "Instructor",
  reviewer: "Reviewer",
  safety_officer: "Safety officer",
  admin: "Admin",
  responder: "Responder",
};

/** Checkbox options for the admin's invite and user forms, in the list's order. */
export const ROLE_OPTIONS: readonly { value: Role; label: string }[] = ROLES.map((value) => ({
  value,
  label: ROLE_LABELS[value],
}));

export function isRole(value: string): value is Role {
  return (ROLES as readonly string[]).includes(value);
}
