import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { users } from "@/db/schema";
import { createRoleSet, createUser, requireDatabase, uniq } from "../support/db";
import { http, signIn } from "../support/http";
import { MATRIX, type Expectation, type MatrixContext, type MatrixRow, type Principal } from "./matrix";
import { responderExpectation } from "./matrix-kit";
import { builtRoutes, discoverRoutes, discoverServerActionFiles } from "./route-tree";

requireDatabase();

const PRINCIPALS: Principal[] = ["anonymous", "instructor", "reviewer", "safety_officer", "admin"];

function matches(status: number, location: string | null, expected: Expectation): boolean {
  if (typeof expected === "number") return status === expected;
  const target = expected.slice(1);
  if (![302, 303, 307, 308].includes(status) || !location) return false;
  const pathname = new URL(location, "http://x").pathname;
  return target === "/" ? pathname === "/" : pathname.startsWith(target);
}

describe("authorization matrix", () => {
  const cookies: Partial<Record<Principal | "responder" | "disabled", string>> = {};
  let roleUsers: MatrixContext["users"];

  beforeAll(async () => {
    const set = await createRoleSet();
    roleUsers = {
      instructor: set.instructor,
      reviewer: set.reviewer,
      safety_officer: set.safety_officer,
      admin: set.admin,
    };
    for (const role of ["instructor", "reviewer", "safety_officer", "admin"] as const) {
      cookies[role] = await signIn(set[role].email);
    }
    // An account that holds only the responder's role: the live sheet, and nothing else.
    const responder = await createUser({ roles: ["responder"] });
    cookies.responder = await signIn(responder.email);
    // A user who signed in and was then disabled: the token is still cryptographically valid.
    const disabled = await createUser({ roles: ["instructor", "reviewer", "safety_officer", "admin"] });
    cookies.disabled = await signIn(disabled.email);
    await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, disabled.id));
  });

  it("has a row for every route handler method and page, and no row for a route that is gone", () => {
    const routes = discoverRoutes();
    const rows = new Set(MATRIX.map((r) => `${r.method} ${r.route}`));
    expect(
      routes.filter((r) => !rows.has(r)),
      "routes without a matrix row",
    ).toEqual([]);
    expect(
      [...rows].filter((r) => !routes.includes(r)),
      "matrix rows without a route",
    ).toEqual([]);
  });

  it("reads the same route tree the production build serves, and finds no server action without rows", () => {
    // Cross-check the source walk against the build's own list, so a file convention the walk does
    // not know (a new extension, a new kind of folder) cannot hide a route from the matrix.
    const built = builtRoutes();
    if (built) {
      const fromSource = new Set(discoverRoutes().map((r) => (r.startsWith("PAGE ") ? r : `ROUTE ${r.split(" ")[1]}`)));
      expect(
        built.filter((r) => !fromSource.has(r)),
        "routes in the build that the source walk missed",
      ).toEqual([]);
    }
    // Server actions are POST endpoints too; the matrix has no rows for them yet, so none may exist.
    expect(discoverServerActionFiles(), "server actions need matrix rows").toEqual([]);
    // A route file that exports no method is reported, not skipped.
    expect(discoverRoutes().filter((r) => r.startsWith("NONE ") || r.includes("* from"))).toEqual([]);
  });

  const cells = (row: MatrixRow) => [
    ...PRINCIPALS.map((p) => [p, row.expect[p]] as const),
    // Named only where a row lets the responder in; refused everywhere else (matrix-kit.ts).
    ["responder", responderExpectation(row.expect)] as const,
    // A disabled user's live token gets what an anonymous visitor gets.
    ["disabled", row.expect.anonymous] as const,
  ];

  for (const row of MATRIX) {
    describe(`${row.method} ${row.route}`, () => {
      for (const [principal, expected] of cells(row)) {
        it(`${principal} → ${expected}`, async () => {
          const target = await createUser({ roles: ["instructor"] });
          const ctx: MatrixContext = { targetUserId: target.id, unique: uniq("matrix"), users: roleUsers, data: {} };
          if (row.prepare) ctx.data = await row.prepare(ctx);
          const url = row.path ? row.path(ctx) : row.route;
          let cookie = principal === "anonymous" ? undefined : cookies[principal];
          if (row.freshSession && principal !== "anonymous" && principal !== "disabled") {
            // A responder has no department; the others sign in fresh in their matrix department.
            const departmentId = principal === "responder" ? null : roleUsers[principal].departmentId;
            const fresh = await createUser({ roles: [principal], departmentId });
            cookie = await signIn(fresh.email);
          }
          const res = await http(url, {
            method: row.method === "PAGE" ? "GET" : row.method,
            cookie,
            body: row.body?.(ctx),
          });
          const ok = matches(res.status, res.headers.get("location"), expected);
          expect(
            ok,
            `${row.method} ${url} as ${principal}: got ${res.status} ${res.headers.get("location") ?? ""} ${res.text.slice(0, 200)}`,
          ).toBe(true);
        });
      }
    });
  }
});
