import type { Role } from "@/lib/roles";

// The one table that maps permissions to roles. Business code asks for a permission, never a role
// name. Record-level rules (own application, own department, separation of duties) live in
// lib/auth/guards.ts and the domain modules, on top of this table.

export const PERMISSIONS = {
  // Using the signed-in workspace at all: every page and route that asks only for a signed-in user
  // (requirePageUser() without a permission, route({ access: "user" })) asks for this. A responder
  // holds none of it, so every page and route refuses that account except the live sheet.
  "workspace.use": ["instructor", "reviewer", "safety_officer", "admin"],
  // Where high voltage is live today (/live and its one-page PDF): for the safety office and for
  // emergency responders.
  "live.read": ["safety_officer", "responder"],
  // The safety committee's report (/reports, its CSV and PDF): institution-wide figures.
  "report.read": ["safety_officer", "admin"],
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
  // Incident and near-miss reports (lib/incidents): anyone signed in reports one; safety officers
  // triage them and see every report, admins read them all. Who else reads one: see
  // INCIDENT_READ_BY_LINKED_PERMIT_HOLDER below.
  "incident.report": ["instructor", "reviewer", "safety_officer", "admin"],
  "incident.triage": ["safety_officer"],
  "incident.read.any": ["safety_officer", "admin"],
  // Apparatus upkeep (lib/upkeep): inspection records, the inspection interval and retiring are kept
  // by those who may edit the apparatus (apparatus.write, its owner and department) and by safety
  // officers for any apparatus.
  "apparatus.upkeep.any": ["safety_officer"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function rolesHave(roles: readonly Role[], permission: Permission): boolean {
  const allowed: readonly Role[] = PERMISSIONS[permission];
  return roles.some((role) => allowed.includes(role));
}

/**
 * Incident reports, record level (decided for issue 17): besides the reporter and incident.read.any,
 * the holder of the permit a report names reads it — they run the set-up and have to act on the
 * findings — but never triages it, and sees it without the reporter's name (people report near misses
 * at a colleague's bench more readily when the colleague does not learn who told). People named on
 * that permit's application, reviewers and the apparatus's owner do not read it through the link.
 */
export const INCIDENT_READ_BY_LINKED_PERMIT_HOLDER = true;
