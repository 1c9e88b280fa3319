import crypto from "node:crypto";
import { eq } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { permits } from "@/db/schema";
import { createSubmittedApplication, createTeam } from "../review/support";
import { requireDatabase, TEST_PASSWORD } from "../support/db";
import { launchBrowser, newContext, seriousA11yViolations, signInWithForm } from "./support/browser";

requireDatabase();

// What only a browser shows about search: the header's box is reached and submitted with the keyboard
// alone, the results page passes axe, and Tab reaches a result that Enter opens.

describe("search, with the keyboard", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("finds a permit from the header and opens it", { timeout: 60_000 }, async () => {
    const team = await createTeam();
    const token = `kb${crypto.randomBytes(4).toString("hex")}`;
    // Tier 0 self-certifies into a permit held by the instructor.
    const { application } = await createSubmittedApplication({
      applicant: team.instructor,
      tier: 0,
      title: `Electroscope ${token}`,
    });
    const [permit] = await getDb().select().from(permits).where(eq(permits.applicationId, application.id));

    const context = await newContext(browser);
    const page = await context.newPage();
    await signInWithForm(page, team.instructor.email, TEST_PASSWORD);
    await page.goto("/");
    // From the top of the page: Tab until the header's search box has the focus.
    let reached = false;
    for (let i = 0; i < 20 && !reached; i++) {
      await page.keyboard.press("Tab");
      reached = await page.evaluate(() => document.activeElement?.id === "header-search");
    }
    expect(reached).toBe(true);
    await page.keyboard.type(token);
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/search\?q=/);
    expect(await page.getByRole("heading", { name: /^Permits \(1\)$/ }).isVisible()).toBe(true);
    expect(await seriousA11yViolations(page), "/search").toEqual([]);

    const link = page.getByRole("link", { name: permit.number });
    for (let i = 0; i < 30 && !(await link.evaluate((el) => el === document.activeElement)); i++) {
      await page.keyboard.press("Tab");
    }
    await page.keyboard.press("Enter");
    await page.waitForURL(`**/permits/${permit.id}`);
    await context.close();
  });
});
