// Apparatus upkeep in a real browser (issue 17, item 5): the owner sets an inspection interval,
// records inspections on the apparatus page and sees the next one overdue, then due ahead; retiring
// the apparatus takes it out of the new-application form's registry picker. (The rules, the reminder
// and the refusals over HTTP: tests/upkeep/upkeep.test.ts.)
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDepartment, createUser, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { http, signIn } from "../support/http";
import { launchBrowser, newContext, signInWithForm } from "./support/browser";

requireDatabase();

/** YYYY-MM-DD, `days` from today (UTC calendar; the institution's day differs by at most one). */
const dayFromNow = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

async function registryChoices(page: Page): Promise<string[]> {
  await page.goto("/applications/new?step=2");
  // Step 2 is on screen once its name field is; the picker is left out when nothing is offered.
  await page.getByLabel("Apparatus name").waitFor();
  const picker = page.getByLabel("Registered apparatus");
  return (await picker.count()) === 0 ? [] : picker.locator("option").allTextContents();
}

describe("apparatus upkeep in the browser", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("shows an inspection overdue then due ahead, and a retired apparatus is no longer offered", async () => {
    const owner = await createUser({ roles: ["instructor"], departmentId: (await createDepartment()).id });
    const name = uniq("Jar bank");
    // 4.7 nF at 10 kV: tier 1 (Q = 47 µC; hazard-model.md's default table).
    const created = await http("/api/apparatus", {
      method: "POST",
      cookie: await signIn(owner.email),
      body: {
        name,
        room: "B12",
        notes: "",
        setup: { sources: [{ id: "C1", kind: "capacitor", capacitance_F: 4.7e-9, voltage_V: 10_000 }] },
      },
    });
    expect(created.status, created.text).toBe(201);
    const id = created.json!.apparatus.id as string;

    const context = await newContext(browser);
    const page = await context.newPage();
    await signInWithForm(page, owner.email, TEST_PASSWORD);
    expect((await registryChoices(page)).some((text) => text.startsWith(name))).toBe(true);

    await page.goto(`/apparatus/${id}`);
    await page.getByLabel("Inspect every (days)").fill("30");
    await page.getByRole("button", { name: "Save", exact: true }).click();
    const status = (text: RegExp) => page.getByTestId("inspection-status").filter({ hasText: text }).waitFor();
    // Registered today and never inspected: due 30 days from now.
    await status(/Next inspection due .*\(\d+ days\)/);

    // A passing inspection 40 days ago: the next was due 10 days ago.
    await page.getByLabel("Day", { exact: true }).fill(dayFromNow(-40));
    await page.getByRole("button", { name: "Record", exact: true }).click();
    await page.getByText("Recorded.").waitFor();
    await status(/^Inspection due since/);

    // Today's inspection: due again in 30 days.
    await page.getByLabel("Day", { exact: true }).fill(dayFromNow(0));
    await page.getByRole("button", { name: "Record", exact: true }).click();
    await status(/Next inspection due .*\(\d+ days\)/);
    await expect
      .poll(() => page.getByRole("list", { name: "Inspection and maintenance records" }).locator("> li").count(), {
        timeout: 10_000,
      })
      .toBe(2);

    await page.getByRole("button", { name: "Retire this apparatus…" }).click();
    await page.getByLabel("Why it is retired").fill("Jars cracked; replaced by a new bank.");
    await page.getByRole("button", { name: "Retire", exact: true }).click();
    await page.getByText("Retired: no more inspections are due.").waitFor();
    expect((await registryChoices(page)).some((text) => text.startsWith(name))).toBe(false);
    await context.close();
  }, 60_000);
});
