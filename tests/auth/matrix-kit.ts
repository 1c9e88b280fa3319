// The authorization matrix's vocabulary (the rows are in matrix-rows/, combined in matrix.ts): every route handler method and every page × every principal →
// the expected answer. tests/auth/matrix.test.ts runs it against the production build and the test
// database, and fails when a route or page exists without a row here. Grow it with every route.
//
// Expected values: an HTTP status, or "→/path" for a redirect whose Location starts with /path.
// The "disabled" principal (a signed-in user disabled afterwards, token still valid) must always get
// what an anonymous visitor gets; the test derives that column from `anonymous`.

import type { Role } from "@/db/schema";

export type Expectation = number | `→${string}`;

// The responder's account (issue 18) may see the live sheet and nothing else. Rows name it only where
// it is let in (tests/auth/matrix-rows/live-reports.ts) or sent somewhere of its own; everywhere else
// its column is derived (responderExpectation below), so every row, old or new, proves it refused.
export type WorkspaceRole = Exclude<Role, "responder">;
/** The principals every row names (the responder's column is optional, see above). */
export type Principal = "anonymous" | WorkspaceRole;
export type Expectations = Record<Principal, Expectation> & { responder?: Expectation };

/**
 * The responder's expected answer when a row does not name it: refused wherever an anonymous visitor
 * is asked to sign in (403 from the API, the 403 page for pages and browser links), and otherwise (a
 * public route, the sign-in page) what any signed-in instructor gets.
 */
export function responderExpectation(expect: Expectations): Expectation {
  if (expect.responder !== undefined) return expect.responder;
  // A route that answers an anonymous visitor as it answers a signed-in one (sign-in itself, health).
  if (expect.instructor === expect.anonymous) return expect.instructor;
  if (expect.anonymous === 401) return 403;
  if (expect.anonymous === "→/sign-in") return "→/forbidden";
  return expect.instructor;
}

export type MatrixContext = {
  /** A user created for this row, for routes that act on "a user". */
  targetUserId: string;
  unique: string;
  /** The users the matrix signs in as, by principal, and their departments. */
  users: Record<WorkspaceRole, { id: string; email: string; departmentId: string | null }>;
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
  expect: Expectations;
  /** The request ends the caller's sessions (sign-out): sign in a fresh user of the role for each cell. */
  freshSession?: boolean;
};

export const everyone = (value: Expectation): Expectations => ({
  anonymous: value,
  instructor: value,
  reviewer: value,
  safety_officer: value,
  admin: value,
});

export const signedIn = (value: Expectation, anonymous: Expectation): Expectations => ({
  ...everyone(value),
  anonymous,
});

export const adminOnly = (ok: Expectation, anonymous: Expectation, denied: Expectation): Expectations => ({
  anonymous,
  instructor: denied,
  reviewer: denied,
  safety_officer: denied,
  admin: ok,
});
