import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createPermitFixture } from "../pdf/support";
import { createUser, requireDatabase, uniq } from "../support/db";
import { baseUrl, signIn } from "../support/http";
import { launchBrowser, newContext, seriousA11yViolations } from "./support/browser";

requireDatabase();

// Issue 18: the live sheet and the committee report pass axe (serious and critical violations only)
// in a real browser, once their charts have drawn. Only a browser runs the chart library's code.

describe("live sheet and committee report in the browser", () => {
  let browser: Browser;
  let departmentId = "";
  let cookies: { name: string; value: string; url: string }[] = [];
  beforeAll(async () => {
    browser = await launchBrowser();
    ({ departmentId } = await createPermitFixture({ tier: 3, room: `Room 4, ${uniq("Axe Hall")}` }));
    const officer = await createUser({ roles: ["safety_officer"] });
    // Signed in over HTTP (the sign-in form is not what this test is about): the session cookie.
    cookies = (await signIn(officer.email)).split("; ").map((pair) => {
      const [name, ...value] = pair.split("=");
      return { name, value: value.join("="), url: baseUrl() };
    });
  });
  afterAll(async () => {
    await browser?.close();
  });

  const signedInPage = async () => {
    const context = await newContext(browser);
    await context.addCookies(cookies);
    return { context, page: await context.newPage() };
  };

  it("has no serious axe violations on /live", async () => {
    const { context, page } = await signedInPage();
    await page.goto("/live");
    await page.getByRole("heading", { name: "Live high voltage now" }).waitFor();
    expect(await seriousA11yViolations(page)).toEqual([]);
    await context.close();
  }, 20_000);

  it("draws the report's charts beside their tables, with no serious axe violations", async () => {
    const { context, page } = await signedInPage();
    // The fixture's own department: its figures, not every other test's rows.
    await page.goto(`/reports?department=${departmentId}`);
    await page.getByRole("heading", { name: "Committee report" }).waitFor();
    // The charts are drawn in the browser (SVG) beside their tables (six sections).
    await page.locator(".recharts-surface").first().waitFor();
    expect(await page.locator(".recharts-surface").count()).toBeGreaterThanOrEqual(6);
    expect(await page.getByRole("table").count()).toBeGreaterThanOrEqual(1);
    expect(await seriousA11yViolations(page)).toEqual([]);
    await context.close();
  }, 30_000);
});
