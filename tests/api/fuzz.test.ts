import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { institutionSettings } from "@/db/schema";
import { MATRIX, type MatrixContext } from "../auth/matrix";
import { createRoleSet, createUser, requireDatabase, uniq } from "../support/db";
import { http, signIn } from "../support/http";

requireDatabase();

// security.md: any JSON body to any mutating endpoint gives 4xx, never 5xx. Every mutating route of
// the authorization matrix gets arbitrary JSON (objects shaped like its real body, and anything at
// all) from a user holding every role, so the request reaches validation and the domain code.

const RUNS_PER_ROUTE = 25;

describe("arbitrary JSON to every mutating endpoint", () => {
  let cookie: string;
  let ctx: Omit<MatrixContext, "data" | "targetUserId">;

  // A random body can be a valid settings change (PATCH /api/admin/settings with permitPrefix "A"):
  // put the institution's settings back so later test files see the defaults they expect.
  let settingsBefore: (typeof institutionSettings.$inferSelect)[] = [];
  afterAll(async () => {
    await getDb().delete(institutionSettings);
    if (settingsBefore.length) await getDb().insert(institutionSettings).values(settingsBefore);
  });

  beforeAll(async () => {
    settingsBefore = await getDb().select().from(institutionSettings);
    const set = await createRoleSet();
    const everyRole = await createUser({
      roles: ["instructor", "reviewer", "safety_officer", "admin"],
      departmentId: set.dept.id,
    });
    cookie = await signIn(everyRole.email);
    ctx = {
      unique: uniq("fuzz"),
      users: {
        instructor: everyRole,
        reviewer: everyRole,
        safety_officer: everyRole,
        admin: everyRole,
      },
    };
  });

  const mutating = MATRIX.filter((row) => row.method !== "GET" && row.method !== "PAGE" && !row.freshSession);

  it("covers every mutating route of the matrix", () => {
    expect(mutating.length).toBeGreaterThanOrEqual(15);
  });

  for (const row of mutating) {
    it(`${row.method} ${row.route} answers below 500`, async () => {
      const target = await createUser({ roles: ["instructor"] });
      const full: MatrixContext = { ...ctx, targetUserId: target.id, data: {} };
      if (row.prepare) full.data = await row.prepare(full);
      const path = row.path ? row.path(full) : row.route;
      const realBody = row.body?.(full);
      // Bodies shaped like the real one with fields replaced, and arbitrary JSON values.
      const keys = realBody && typeof realBody === "object" && !Array.isArray(realBody) ? Object.keys(realBody) : [];
      const shaped =
        keys.length > 0 ? fc.dictionary(fc.constantFrom(...keys), fc.jsonValue(), { maxKeys: 6 }) : fc.jsonValue();
      const bodies = fc.oneof(shaped, fc.jsonValue({ maxDepth: 3 }));
      await fc.assert(
        fc.asyncProperty(bodies, async (body) => {
          const res = await http(path, {
            method: row.method,
            cookie,
            rawBody: JSON.stringify(body ?? null),
            headers: { "content-type": "application/json" },
          });
          expect(
            res.status,
            `${row.method} ${path} with ${JSON.stringify(body).slice(0, 200)} → ${res.text.slice(0, 200)}`,
          ).toBeLessThan(500);
        }),
        { numRuns: RUNS_PER_ROUTE },
      );
    });
  }
});
