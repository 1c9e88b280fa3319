// The authorization matrix's vocabulary (the rows are in matrix-rows/, combined in matrix.ts): every route handler method and every page × every principal →
// the expected answer. tests/auth/matrix.test.ts runs it against the production build and the test
// database, and fails when a route or page exists without a row here. Grow it with every route.
//
// Expected values: an HTTP status, or "→/path" for a redirect whose Location starts with /path.
// The "disabled" principal (a signed-in user disabled afterwards, token still valid) must always get
// what an anonymous visitor gets; the test derives that column from `anonymous`.

import type { Role } from "@/db/schema";

export type Principal = "anonymous" | Role;
export type Expectation = number | `→${string}`;

export type MatrixContext = {
  /** A user created for this row, for routes that act on "a user". */
  targetUserId: string;
  unique: string;
  /** The users the matrix signs in as, by principal, and their departments. */
  users: Record<Role, { id: string; email: string; departmentId: string | null }>;
  /** Whatever the row's `prepare` returned (ids of records it created for this cell). */
  data: Record<string, string>;
};

export type MatrixRow = {
  /** The route as its folder names it, e.g. "/api/admin/users/[id]" or "/admin/users". */
  route: string;
  method: "GET" | "POST" | "PATCH" | "PUT" | "DELETE" | "PAGE";
  /** Creates the records this cell acts on (runs once per cell, before the request). */
  prepare?: (ctx: MatrixContext) => Promise<Record<string, string>>;
  path?: (ctx: MatrixContext) => string;
  body?: (ctx: MatrixContext) => unknown;
  expect: Record<Principal, Expectation>;
  /** The request ends the caller's sessions (sign-out): sign in a fresh user of the role for each cell. */
  freshSession?: boolean;
};

export const everyone = (value: Expectation): Record<Principal, Expectation> => ({
  anonymous: value,
  instructor: value,
  reviewer: value,
  safety_officer: value,
  admin: value,
});

export const signedIn = (value: Expectation, anonymous: Expectation): Record<Principal, Expectation> => ({
  ...everyone(value),
  anonymous,
});

export const adminOnly = (
  ok: Expectation,
  anonymous: Expectation,
  denied: Expectation,
): Record<Principal, Expectation> => ({
  anonymous,
  instructor: denied,
  reviewer: denied,
  safety_officer: denied,
  admin: ok,
});
