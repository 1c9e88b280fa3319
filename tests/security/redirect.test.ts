// Issue 14, open redirect after sign-in: the `from` a sign-in returns to is resolved the way a browser
// resolves a link and reduced to a path and query on this site. The attack strings below are read by
// the WHATWG URL Standard's parser (https://url.spec.whatwg.org/, "basic URL parser": ASCII tab and
// newline are removed anywhere, leading/trailing C0 controls and spaces are stripped, and in special
// schemes "\" is read as "/"), so "/\t/evil.example" is the scheme-relative "//evil.example".
import { describe, expect, it } from "vitest";
import { safeReturnPath } from "@/lib/http/return-path";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import { baseUrl, http } from "../support/http";

requireDatabase();

// Each of these leaves the site when a browser follows it (WHATWG URL Standard, as above).
const OFF_SITE = [
  "/\t/evil.example",
  "/\n/evil.example",
  "/\r\n/evil.example",
  "//evil.example",
  "///evil.example",
  "/\\evil.example",
  "/\\/evil.example",
  "\\\\evil.example",
  "https://evil.example",
  "http:evil.example",
  "HTTPS://evil.example/path",
  "javascript:alert(1)",
  " //evil.example",
  "\u0000//evil.example",
  "\u001f//evil.example",
  "/\t\\evil.example",
  "//evil.example@benchclear.invalid",
  "/.//evil.example",
];

describe("safeReturnPath", () => {
  it("turns every off-site target into a path on this site", () => {
    for (const raw of OFF_SITE) {
      const out = safeReturnPath(raw);
      // Whatever comes back, a browser resolving it against our page stays on our origin.
      expect(new URL(out, "https://app.aldermere.example/sign-in").origin, JSON.stringify(raw)).toBe(
        "https://app.aldermere.example",
      );
      expect(out.startsWith("/") && !out.startsWith("//") && !out.startsWith("/\\"), JSON.stringify(raw)).toBe(true);
    }
  });

  it("keeps an ordinary path and query, drops the fragment, and leaves percent-escapes as escapes", () => {
    expect(safeReturnPath("/applications/42?tab=review")).toBe("/applications/42?tab=review");
    expect(safeReturnPath("/permits#top")).toBe("/permits");
    // %2F%2F is data inside one path segment, not a host: still on this site (WHATWG URL Standard).
    expect(safeReturnPath("/%2F%2Fevil.example")).toBe("/%2F%2Fevil.example");
    expect(safeReturnPath("/%5C%5Cevil.example")).toBe("/%5C%5Cevil.example");
    expect(safeReturnPath(undefined)).toBe("/");
    expect(safeReturnPath("x".repeat(3000))).toBe("/");
  });
});

describe("POST /api/session redirectTo", () => {
  it("answers a path on this site for every off-site `from`", async () => {
    const user = await createUser({ roles: ["instructor"] });
    for (const from of OFF_SITE) {
      const res = await http("/api/session", {
        method: "POST",
        body: { email: user.email, password: TEST_PASSWORD, from },
      });
      expect(res.status, JSON.stringify(from)).toBe(200);
      const target = String(res.json?.redirectTo);
      expect(new URL(target, "https://app.aldermere.example/sign-in").origin, JSON.stringify(from)).toBe(
        "https://app.aldermere.example",
      );
    }
    const ok = await http("/api/session", {
      method: "POST",
      body: { email: user.email, password: TEST_PASSWORD, from: "/applications?state=draft" },
    });
    expect(ok.json?.redirectTo).toBe("/applications?state=draft");
  });

  it("the sign-in page of a signed-in visitor redirects only on this site", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const signedIn = await http("/api/session", {
      method: "POST",
      body: { email: user.email, password: TEST_PASSWORD },
    });
    const cookie = signedIn.headers
      .getSetCookie()
      .map((c) => c.split(";")[0])
      .join("; ");
    const res = await http(`/sign-in?from=${encodeURIComponent("/\t/evil.example")}`, { cookie });
    expect([303, 307, 308]).toContain(res.status);
    const location = res.headers.get("location") ?? "";
    expect(new URL(location, baseUrl() + "/sign-in").origin).toBe(new URL(baseUrl()).origin);
  });
});
