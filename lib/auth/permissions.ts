import type { Role } from "@/lib/roles";

// The one table that maps permissions to roles. Business code asks for a permission, never a role
// name. Record-level rules (own application, own department, separation of duties) live in
// lib/auth/guards.ts and the domain modules, on top of this table.

export const PERMISSIONS = {
  "hazard.assess": ["instructor", "reviewer", "safety_officer", "admin"],
  "apparatus.read": ["instructor", "reviewer", "safety_officer", "admin"],
  "apparatus.write": ["instructor", "reviewer", "safety_officer"],
  "application.create": ["instructor", "reviewer", "safety_officer"],
  "application.submit": ["instructor", "reviewer", "safety_officer"],
  "application.withdraw": ["instructor", "reviewer", "safety_officer"],
  // Reviewers review their own department's applications; officers review any.
  "application.review": ["reviewer", "safety_officer"],
  "application.review.any": ["safety_officer"],
  "application.read.any": ["safety_officer"],
  "permit.approve": ["safety_officer"],
  "permit.reject": ["safety_officer"],
  "permit.revoke": ["safety_officer"],
  "permit.read.any": ["safety_officer"],
  // Pre-use checks at the bench (lib/checks): the holder and the people named on the permit record
  // them; safety officers may record one on any permit. Admins do not see permits, so they do not.
  "permit.check": ["instructor", "reviewer", "safety_officer"],
  "permit.check.any": ["safety_officer"],
  "audit.export": ["safety_officer"],
  "admin.users": ["admin"],
  "admin.rules": ["admin"],
  // Walking the audit chain and the decision seals (/admin/records).
  "admin.records": ["admin"],
  "dev.mail": ["admin"],
  // Training records (issue 17): admins define course types; officers and admins record training and
  // read anyone's record; officers get the reminders before a course lapses.
  "training.courses": ["admin"],
  "training.record": ["safety_officer", "admin"],
  "training.reminded": ["safety_officer"],
  // The header's search box (lib/search); each kind of result keeps its own read rule on top.
  search: ["instructor", "reviewer", "safety_officer", "admin"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function rolesHave(roles: readonly Role[], permission: Permission): boolean {
  const allowed: readonly Role[] = PERMISSIONS[permission];
  return roles.some((role) => allowed.includes(role));
}
