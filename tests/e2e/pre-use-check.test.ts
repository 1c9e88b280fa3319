// The pre-use check on a phone (390 px wide), in a real browser: the bench card's link asks for a
// sign-in and comes back to the check; the answers survive a submit whose answer never arrives and a
// network that is then cut; once the signal returns the check is sent again with the same key and
// recorded exactly once.
import { eq } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { preUseChecks, users } from "@/db/schema";
import { requireDatabase, TEST_PASSWORD } from "../support/db";
import { createPermitFixture } from "../pdf/support";
import { checklistOf } from "../checks/support";
import { launchBrowser, newContext } from "./support/browser";

requireDatabase();

describe("pre-use check on a phone", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("keeps the answers through a lost answer and a cut network, and records the check once", async () => {
    const f = await createPermitFixture({ tier: 3 });
    const [holder] = await getDb().select({ email: users.email }).from(users).where(eq(users.id, f.holder.id));
    const items = checklistOf(f);
    const context = await newContext(browser, { width: 390, height: 844 });
    const page = await context.newPage();

    // The QR code's address, signed out: sign in, and land back on the check.
    await page.goto(`/permits/${f.permit.id}/check`);
    await page.waitForURL(/\/sign-in\?from=/);
    await page.getByLabel("E-mail").fill(holder.email);
    await page.getByLabel("Password").fill(TEST_PASSWORD);
    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    await page.waitForURL((url) => url.pathname === `/permits/${f.permit.id}/check`);

    const cards = page.locator("form li");
    await expect.poll(() => cards.count()).toBe(items.length);
    for (let i = 0; i < items.length; i++) {
      await cards
        .nth(i)
        .locator("label", { hasText: i === 1 ? "Not applicable" : "Yes" })
        .click();
    }
    // Large targets (WCAG 2.5.5: at least 44 × 44 CSS px) and nothing wider than the phone.
    const box = await cards.first().locator("label", { hasText: "Yes" }).boundingBox();
    expect(box!.height).toBeGreaterThanOrEqual(44);
    expect(box!.width).toBeGreaterThanOrEqual(44);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);

    // The first submit reaches the server, but its answer is lost on the way back.
    let cut = 0;
    await page.route("**/api/permits/*/checks", async (route) => {
      cut += 1;
      await route.fetch();
      await route.abort("internetdisconnected");
    });
    await page.getByRole("button", { name: "Record the check" }).click();
    await page.getByText("Not sent yet").waitFor();
    await page.unroute("**/api/permits/*/checks");
    expect(cut).toBe(1);
    // Then the network goes altogether: the answers stay, on the page and on the phone.
    await context.setOffline(true);
    expect(await cards.nth(1).locator('input[value="na"]').isChecked()).toBe(true);
    expect(await cards.nth(0).locator('input[value="yes"]').isChecked()).toBe(true);
    expect(await page.evaluate(() => Object.keys(localStorage).some((key) => key.includes("pre-use-check")))).toBe(
      true,
    );

    await context.setOffline(false);
    // The page sends it again when the phone is back online; the button does the same at once.
    await page
      .getByRole("button", { name: "Send again now" })
      .click({ timeout: 2_000 })
      .catch(() => undefined);
    await page.getByTestId("check-recorded").waitFor();

    const rows = await getDb().select().from(preUseChecks).where(eq(preUseChecks.permitId, f.permit.id));
    expect(rows).toHaveLength(1);
    expect(rows[0].items.map((item) => item.answer)).toEqual(items.map((_, i) => (i === 1 ? "na" : "yes")));
    await context.close();
  });
});
