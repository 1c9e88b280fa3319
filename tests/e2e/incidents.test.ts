// Incident reports in a real browser (issue 17, item 3): a permit's holder reports a near miss
// through the form with the permit preselected and finds it on the permit's page; a safety officer
// moves it to "investigating" with findings and revokes the permit from the report, signing with
// their password. (Each step's rules, mail and audit: tests/incidents/incidents.test.ts.)
import { eq } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { incidents, permits, users } from "@/db/schema";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import { createPermitFixture } from "../pdf/support";
import { launchBrowser, newContext, signInWithForm } from "./support/browser";

requireDatabase();

describe("incident reports in the browser", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("reports a near miss on a permit, shows it there, and an officer triages it and revokes the permit", async () => {
    const f = await createPermitFixture({ tier: 0 });
    const [holder] = await getDb().select({ email: users.email }).from(users).where(eq(users.id, f.holder.id));
    const officer = await createUser({ roles: ["safety_officer"] });
    const summary = `Grounding hook found unclipped ${f.permit.number}`;

    const holderContext = await newContext(browser);
    const page = await holderContext.newPage();
    await signInWithForm(page, holder.email, TEST_PASSWORD);
    // The permit page's link preselects the permit in the form.
    await page.goto(`/incidents/new?permit=${f.permit.id}`);
    await page.getByLabel("Near miss").check();
    await page.getByLabel("In a line, what happened").fill(summary);
    await page.getByLabel("Describe it").fill("The hook lay on the bench, not on the terminal, during the break.");
    await page.getByLabel(/^Where/).fill("B12 lecture theatre");
    await page.getByRole("radio", { name: "No", exact: true }).check();
    expect(await page.getByLabel("Permit", { exact: true }).inputValue()).toBe(f.permit.id);
    await page.getByRole("button", { name: "Send the report" }).click();
    await page.waitForURL(/\/incidents\/[0-9a-f-]{36}$/);
    const incidentPath = new URL(page.url()).pathname;
    await page.getByRole("heading", { name: new RegExp(summary) }).waitFor();

    // The report is listed on the permit it names.
    await page.goto(`/permits/${f.permit.id}`);
    await page
      .getByRole("link", { name: /^IR-\d+/ })
      .first()
      .waitFor();
    await page.getByText(summary).first().waitFor();
    await holderContext.close();

    const officerContext = await newContext(browser);
    const officerPage = await officerContext.newPage();
    await signInWithForm(officerPage, officer.email, TEST_PASSWORD);
    await officerPage.goto(incidentPath);
    await officerPage.getByLabel("State", { exact: true }).selectOption("investigating");
    await officerPage
      .getByLabel("Findings", { exact: true })
      .fill("The hook's clip is worn and slips off the terminal.");
    await officerPage.getByRole("button", { name: "Save", exact: true }).click();
    await officerPage.getByText("Saved.").waitFor();

    await officerPage.getByLabel(/^Reason/).fill("Grounding hook not in place during use (incident report).");
    await officerPage.getByLabel("Your password").fill(TEST_PASSWORD);
    await officerPage.getByRole("button", { name: "Revoke the permit" }).click();
    // The page refreshes: the permit is revoked, so the form gives way to the report's new step.
    await officerPage.getByText("Permit revoked from this report").waitFor();
    await officerContext.close();

    const [report] = await getDb().select().from(incidents).where(eq(incidents.permitId, f.permit.id));
    expect(report.state).toBe("investigating");
    expect(report.permitRevokedAt).not.toBeNull();
    const [permit] = await getDb().select({ state: permits.state }).from(permits).where(eq(permits.id, f.permit.id));
    expect(permit.state).toBe("revoked");
  }, 60_000);
});
