import path from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { requireDatabase } from "../support/db";
import { randomIp } from "../support/http";
import { launchBrowser, newContext, seriousA11yViolations } from "../e2e/support/browser";
import { createPermitFixture, revokeFixture } from "../pdf/support";

requireDatabase();

// The page a permit's QR code opens, in a real browser on a phone-sized screen: the status reads at a
// glance (large, in words, with colour), the page fits the screen, it passes axe's serious checks,
// and a revocation shows on reload. Set BENCHCLEAR_SCREENSHOTS=<dir> to keep screenshots for review.

/** A common 6.1-inch phone screen in CSS pixels. */
const PHONE = { width: 390, height: 844 };

describe("the verification page on a phone", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("shows the live status large and in words, fits the screen, and changes on revocation", async () => {
    const fixture = await createPermitFixture({ tier: 3 });
    const context = await newContext(browser, PHONE);
    // A fresh client address, as a phone behind the institution's proxy would have.
    await context.setExtraHTTPHeaders({ "x-forwarded-for": randomIp() });
    const page = await context.newPage();
    await page.goto(`/verify/${fixture.permit.verificationCode}`);

    const status = page.getByRole("heading", { level: 1 });
    expect(await status.textContent()).toBe("Active");
    // 3rem at the root's 16 px: readable at arm's length.
    expect(parseFloat(await status.evaluate((el) => getComputedStyle(el).fontSize))).toBeGreaterThanOrEqual(40);
    expect(await page.getByText(fixture.permit.number).isVisible()).toBe(true);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width);
    expect(await seriousA11yViolations(page)).toEqual([]);
    const screenshots = process.env.BENCHCLEAR_SCREENSHOTS;
    if (screenshots) await page.screenshot({ path: path.join(screenshots, "verify-active.png"), fullPage: true });

    await revokeFixture(fixture);
    await page.reload();
    expect(await page.getByRole("heading", { level: 1 }).textContent()).toBe("Revoked");
    expect(await seriousA11yViolations(page)).toEqual([]);
    if (screenshots) await page.screenshot({ path: path.join(screenshots, "verify-revoked.png"), fullPage: true });

    await page.goto(`/verify/${"n".repeat(43)}`);
    expect(await page.getByRole("heading", { level: 1 }).textContent()).toBe("Unknown");
    if (screenshots) await page.screenshot({ path: path.join(screenshots, "verify-unknown.png"), fullPage: true });
    await context.close();
  });
});
