import { beforeAll, describe, expect, it } from "vitest";
import { createUser, requireDatabase } from "../support/db";
import { http, signIn } from "../support/http";

requireDatabase();

// One status for a bad id (issue 16): every route whose path names a record answers an id that is
// not a UUID with the 404 of a record that does not exist, before it reads the body, never a 422 in
// one route and a 404 in the next. The caller has every permission, so the 404 is about the id.
describe("record ids in API paths", () => {
  let cookie: string;
  beforeAll(async () => {
    const everyone = await createUser({ roles: ["instructor", "reviewer", "safety_officer", "admin"] });
    cookie = await signIn(everyone.email);
  });

  const cases: [method: string, path: string, body?: unknown][] = [
    ["GET", "/api/permits/not-an-id"],
    ["POST", "/api/permits/not-an-id/revoke", { expectedVersion: 1, password: "x", reason: "x" }],
    ["POST", "/api/permits/not-an-id/renew", {}],
    ["POST", "/api/review/not-an-id/decisions", { kind: "recommend", expectedVersion: 1 }],
    ["PATCH", "/api/admin/users/not-an-id", { disabled: true }],
    ["GET", "/api/apparatus/not-an-id"],
    ["GET", "/api/applications/not-an-id/draft"],
    ["POST", "/api/applications/not-an-id/duplicate", {}],
    ["GET", "/api/applications/00000000-0000-4000-8000-000000000000/attachments/not-an-id"],
  ];

  it.each(cases)("%s %s answers 404 not_found", async (method, path, body) => {
    const res = await http(path, { method, cookie, body });
    expect(res.status).toBe(404);
    expect(res.json?.error.code).toBe("not_found");
  });

  it("still answers 422 naming the field when the id is well formed and the body is not", async () => {
    const res = await http("/api/permits/00000000-0000-4000-8000-000000000000/revoke", {
      method: "POST",
      cookie,
      body: { expectedVersion: "one" },
    });
    expect(res.status).toBe(422);
    expect(res.json?.error.issues.map((i: { path: string }) => i.path)).toContain("expectedVersion");
  });
});
