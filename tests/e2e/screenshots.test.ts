import { and, eq } from "drizzle-orm";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { apparatus, applications, permits } from "@/db/schema";
import { DEMO_PASSWORD, seed } from "@/scripts/demo-data";
import { requireDatabase } from "../support/db";
import { randomIp } from "../support/http";
import { launchBrowser, newContext, signInWithForm } from "./support/browser";
import { DOCS_SCREENSHOT_DIR, screenshot } from "./support/journey";

requireDatabase();

// The README's screenshots, taken from the demo story (scripts/demo-data.ts) as a new user of the demo would
// see it, so no test-made name ever shows. Runs only on purpose, alone, on a fresh test database:
//   npm run screenshots   (UPDATE_SCREENSHOTS=1 npm test -- tests/e2e/screenshots.test.ts)
// and writes docs/screenshots/*.png.

const DESKTOP = { width: 1280, height: 800 };
/** A common 6.1-inch phone screen in CSS pixels. */
const PHONE = { width: 390, height: 844 };
/** A test-made name ends in "-" and ten hex digits (tests/support/db.ts uniq()). */
const TEST_MADE = /-[0-9a-f]{10}\b/;

describe.skipIf(process.env.UPDATE_SCREENSHOTS !== "1")("README screenshots from the demo story", () => {
  let browser: Browser;
  const contexts: BrowserContext[] = [];

  async function signedIn(email: string | null, viewport = DESKTOP): Promise<Page> {
    const context = await newContext(browser, viewport);
    contexts.push(context);
    const page = await context.newPage();
    if (email) await signInWithForm(page, email, DEMO_PASSWORD);
    return page;
  }

  async function shoot(page: Page, name: string) {
    await expect.poll(() => page.getByRole("heading", { level: 1 }).first().isVisible()).toBe(true);
    expect(await page.locator("body").innerText()).not.toMatch(TEST_MADE);
    await screenshot(page, name, DOCS_SCREENSHOT_DIR);
  }

  async function applicationId(title: string) {
    const [row] = await getDb().select({ id: applications.id }).from(applications).where(eq(applications.title, title));
    expect(row, title).toBeDefined();
    return row.id;
  }

  async function permitOf(title: string) {
    const [row] = await getDb()
      .select({ id: permits.id, code: permits.verificationCode })
      .from(permits)
      .innerJoin(applications, eq(applications.id, permits.applicationId))
      .where(eq(applications.title, title));
    expect(row, title).toBeDefined();
    return row;
  }

  beforeAll(async () => {
    await seed();
    browser = await launchBrowser();
  }, 180_000);

  afterAll(async () => {
    for (const c of contexts) await c.close().catch(() => undefined);
    await browser?.close();
  });

  it(
    "takes the instructor's screens: dashboard, apparatus, form steps 2 and 3, permit",
    { timeout: 120_000 },
    async () => {
      const page = await signedIn("instructor@benchclear.test");
      await page.goto("/");
      await shoot(page, "dashboard");

      const [bank] = await getDb()
        .select({ id: apparatus.id })
        .from(apparatus)
        .where(and(eq(apparatus.name, "Pulsed capacitor bank")));
      await page.goto(`/apparatus/${bank.id}`);
      await shoot(page, "apparatus-detail");

      // The draft reopens at the step it was saved on; the address names the step to show.
      await page.goto(`/applications/${await applicationId("Sphere generator for the open day")}/edit?step=2`);
      await expect.poll(() => page.getByTestId("step-heading").textContent()).toBe("Step 2 of 6: Apparatus");
      await expect.poll(() => page.getByTestId("live-tier").textContent()).toContain("Tier 2");
      await shoot(page, "application-step-2-live-figures");
      await page.getByRole("button", { name: "Next: Hazard result" }).click();
      await expect.poll(() => page.getByTestId("step-heading").textContent()).toBe("Step 3 of 6: Hazard result");
      expect(await page.getByRole("note", { name: "About these figures" }).isVisible()).toBe(true);
      await shoot(page, "application-step-3-hazard-result");

      const active = await permitOf("Jar bank for the spring lecture series");
      await page.goto(`/permits/${active.id}`);
      await shoot(page, "permit");
    },
  );

  it("takes the reviewer's decision panel", { timeout: 60_000 }, async () => {
    const page = await signedIn("reviewer@benchclear.test");
    await page.goto(`/applications/${await applicationId("Discharge tubes for first-year optics")}`);
    await page.getByLabel(/Return for changes/).check();
    await page.getByLabel(/^Comment/).fill("Say who holds the grounding hook while the tubes are changed.");
    await shoot(page, "review-decision-panel");
  });

  it("takes the public status page on a phone, active and revoked", { timeout: 60_000 }, async () => {
    const phone = await signedIn(null, PHONE);
    await phone.context().setExtraHTTPHeaders({ "x-forwarded-for": randomIp() });
    await phone.goto(`/verify/${(await permitOf("Jar bank for the spring lecture series")).code}`);
    expect(await phone.getByRole("heading", { level: 1 }).textContent()).toBe("Active");
    await shoot(phone, "verify-phone");
    await phone.goto(`/verify/${(await permitOf("Sphere generator in the outreach hall")).code}`);
    expect(await phone.getByRole("heading", { level: 1 }).textContent()).toBe("Revoked");
    await shoot(phone, "verify-phone-revoked");
  });
});
