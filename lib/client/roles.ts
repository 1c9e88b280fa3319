// Role names and labels for forms (the server's list is db/schema/users.ts ROLES).
export const ROLE_OPTIONS = [
  { value: "instructor", label: "Instructor" },
  { value: "reviewer", label: "Reviewer" },
  { value: "safety_officer", label: "Safety officer" },
  { value: "admin", label: "Admin" },
] as const;

export type RoleValue = (typeof ROLE_OPTIONS)[number]["value"];
