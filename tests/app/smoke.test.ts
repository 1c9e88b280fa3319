import { describe, expect, it } from "vitest";
import { http } from "../support/http";

// The production build that `npm test` serves answers its first pages.
describe("the production build", () => {
  it("sends a signed-out visitor of / to the sign-in page", async () => {
    const res = await http("/");
    expect(res.status).toBe(307);
    expect(res.headers.get("location")).toMatch(/\/sign-in$/);
  });

  it("serves the sign-in page with the product name, the note about the figures and security headers", async () => {
    const res = await http("/sign-in");
    expect(res.status).toBe(200);
    expect(res.text).toContain("Sign in to Benchclear");
    expect(res.text).toContain("About these figures");
    expect(res.text).toContain("engineering estimate");
    expect(res.text).toContain("qualified person");
    const csp = res.headers.get("content-security-policy") ?? "";
    expect(csp).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+' 'strict-dynamic'/);
    expect(csp).toContain("object-src 'none'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    expect(res.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
    expect(res.headers.get("x-powered-by")).toBeNull();
  });

  it("answers an unknown page with the not-found page", async () => {
    const res = await http("/sign-in/nothing-here");
    expect(res.status).toBe(404);
  });
});
