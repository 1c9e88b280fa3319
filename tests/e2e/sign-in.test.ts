import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import { launchBrowser, newContext, seriousA11yViolations, signInWithForm } from "./support/browser";

requireDatabase();

describe("signing in, in a real browser", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("shows a field error and an announced message, then signs in and out", async () => {
    const user = await createUser({ roles: ["admin"] });
    const context = await newContext(browser, { width: 390, height: 844 });
    const page = await context.newPage();
    await page.goto("/sign-in");
    expect(await seriousA11yViolations(page)).toEqual([]);

    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    await expect.poll(() => page.getByText("Enter your e-mail address.").isVisible()).toBe(true);
    expect(await page.getByLabel("E-mail").getAttribute("aria-invalid")).toBe("true");

    await page.getByLabel("E-mail").fill(user.email);
    await page.getByLabel("Password").fill("not the password");
    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    // Next's route announcer is an alert too: pick the form's own.
    await page.getByRole("alert").filter({ hasText: "do not match" }).waitFor();

    await signInWithForm(page, user.email, TEST_PASSWORD);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Dashboard");
    expect(await seriousA11yViolations(page)).toEqual([]);

    // On a phone the navigation sits behind the menu button, with the sign-out button in it.
    await page.getByRole("button", { name: /menu/i }).click();
    await page.getByRole("button", { name: "Sign out" }).first().click();
    await page.waitForURL(/\/sign-in/);
    await page.goto("/account");
    await page.waitForURL(/\/sign-in/);
    await context.close();
  });
});
