import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applications, permits } from "@/db/schema";
import { applicationDraftSchema } from "@/lib/applications/schemas";
import { createSubmittedApplication, createTeam } from "../review/support";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import { http, signIn } from "../support/http";
import { launchBrowser, newContext, seriousA11yViolations, signInWithForm } from "./support/browser";

requireDatabase();

// The whole review chain in a real browser: a tier-3 application is returned by the department's
// reviewer with a comment, revised and resubmitted by the instructor (through the drafts API the
// edit page uses), recommended by the reviewer and approved by the safety officer with their
// password and the tier's conditions; the permit then shows as active. axe-core checks each page.

async function expectNoSeriousViolations(page: Page, where: string) {
  expect(await seriousA11yViolations(page), where).toEqual([]);
}

describe("the review chain, in a real browser", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it(
    "returns, resubmits, recommends and approves a tier-3 application into an active permit",
    { timeout: 180_000 },
    async () => {
      const team = await createTeam();
      const title = "Capacitor bank for the winter lecture";
      const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 3, title });

      // The reviewer finds it in the queue and returns it with a comment pinned to the operators.
      const reviewerContext = await newContext(browser);
      const reviewer = await reviewerContext.newPage();
      await signInWithForm(reviewer, team.reviewer.email, TEST_PASSWORD);
      await reviewer.goto("/review");
      await expectNoSeriousViolations(reviewer, "/review");
      await reviewer.getByRole("link", { name: title }).click();
      await reviewer.waitForURL(`**/applications/${application.id}`);
      await expect.poll(() => reviewer.getByRole("heading", { level: 1 }).textContent()).toBe(title);
      await expectNoSeriousViolations(reviewer, "/applications/[id] with the decision panel");
      await reviewer.getByLabel(/Return for changes/).check();
      await reviewer.getByLabel(/^Comment/).fill("Name the second trained person who will be present.");
      await reviewer.getByLabel("Pin the comment to").selectOption("event.operators");
      await reviewer.getByRole("button", { name: "Return to the applicant" }).click();
      await expect
        .poll(() => reviewer.getByRole("status").first().textContent())
        .toContain("Returned to the applicant");
      await expect.poll(async () => (await reload(application.id)).state).toBe("returned");

      // The instructor revises the draft and submits it again, as the edit page does.
      const instructorCookie = await signIn(team.instructor.email);
      const draftRes = await http(`/api/applications/${application.id}/draft`, { cookie: instructorCookie });
      expect(draftRes.status).toBe(200);
      const draft = applicationDraftSchema.parse(draftRes.json?.application.draft);
      draft.event.operators = [{ userId: null, name: "Sam Okafor", trained: true }];
      draft.attestation.accepted = true;
      const saved = await http(`/api/applications/${application.id}/draft`, {
        method: "PATCH",
        cookie: instructorCookie,
        body: { expectedVersion: draftRes.json?.application.version, step: 6, draft },
      });
      expect(saved.status, saved.text).toBe(200);
      const submitted = await http(`/api/applications/${application.id}/submit`, {
        method: "POST",
        cookie: instructorCookie,
        body: { expectedVersion: saved.json?.application.version },
      });
      expect(submitted.status, submitted.text).toBe(200);
      expect((await reload(application.id)).state).toBe("submitted");

      // The reviewer sees what changed and recommends revision 2.
      await reviewer.goto(`/applications/${application.id}`);
      await expect
        .poll(() => reviewer.getByRole("heading", { name: "Changes since revision 1" }).isVisible())
        .toBe(true);
      await expect.poll(() => reviewer.getByText("Sam Okafor (trained)").first().isVisible()).toBe(true);
      await reviewer.getByLabel(/^Recommend/).check();
      await reviewer.getByRole("button", { name: "Sign the recommendation" }).click();
      await expect.poll(() => reviewer.getByRole("status").first().textContent()).toContain("recommendation is signed");
      await expect.poll(async () => (await reload(application.id)).state).toBe("in_review");
      await reviewerContext.close();

      // The safety officer approves with the tier's conditions and their password.
      const officerContext = await newContext(browser);
      const officer = await officerContext.newPage();
      await signInWithForm(officer, team.officer.email, TEST_PASSWORD);
      await officer.goto("/review");
      await officer.getByRole("link", { name: title }).click();
      await officer.waitForURL(`**/applications/${application.id}`);
      await officer.getByLabel(/^Approve/).check();
      await expectNoSeriousViolations(officer, "/applications/[id] approving");
      await officer.getByRole("button", { name: "Sign and approve" }).click();
      // Unconfirmed conditions and a missing password are named before anything is sent.
      await expect.poll(() => officer.getByText("Confirm every requirement of this tier.").isVisible()).toBe(true);
      await officer.getByLabel("A second trained person is present whenever the set-up is energised.").check();
      await officer.getByLabel("A barrier stands at the limited approach distance.").check();
      await officer.getByRole("textbox", { name: /^Your password/ }).fill("not my password");
      await officer.getByRole("button", { name: "Sign and approve" }).click();
      await expect.poll(() => officer.getByText("The password is not correct.").first().isVisible()).toBe(true);
      await officer.getByRole("textbox", { name: /^Your password/ }).fill(TEST_PASSWORD);
      await officer.getByRole("button", { name: "Sign and approve" }).click();
      await expect
        .poll(() => officer.getByRole("status").first().textContent())
        .toMatch(/Permit [A-Z][A-Z0-9]{0,5}-\d{4}-\d{4} is issued/);
      await expectNoSeriousViolations(officer, "/applications/[id] approved");

      const [permit] = await getDb().select().from(permits).where(eq(permits.applicationId, application.id));
      expect(permit.conditions).toEqual([
        "A second trained person is present whenever the set-up is energised.",
        "A barrier stands at the limited approach distance.",
      ]);
      await officer.goto(`/permits/${permit.id}`);
      await expect.poll(() => officer.getByRole("heading", { level: 1 }).textContent()).toBe(permit.number);
      await expect
        .poll(() => officer.locator("main").getByText("Active", { exact: true }).first().isVisible())
        .toBe(true);
      await expect.poll(() => officer.locator("main").getByText(team.officer.name).first().isVisible()).toBe(true);
      await expectNoSeriousViolations(officer, "/permits/[id]");
      await officerContext.close();

      // The holder finds it among their permits, active, with the renewal offered.
      const holderContext = await newContext(browser);
      const holder = await holderContext.newPage();
      await signInWithForm(holder, team.instructor.email, TEST_PASSWORD);
      await holder.goto("/permits");
      await expect.poll(() => holder.getByRole("link", { name: permit.number }).isVisible()).toBe(true);
      await expectNoSeriousViolations(holder, "/permits");
      await holder.getByRole("link", { name: permit.number }).click();
      await holder.waitForURL(`**/permits/${permit.id}`);
      await expect
        .poll(() => holder.locator("main").getByText("Active", { exact: true }).first().isVisible())
        .toBe(true);
      await expect.poll(() => holder.getByRole("button", { name: "Renew this permit" }).isVisible()).toBe(true);
      await holderContext.close();
    },
  );
});

describe("the rules page, in a real browser", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("shows the rules in force and adopts a reminder schedule", { timeout: 60_000 }, async () => {
    const admin = await createUser({ roles: ["admin"] });
    const context = await newContext(browser);
    const page = await context.newPage();
    await signInWithForm(page, admin.email, TEST_PASSWORD);
    await page.goto("/admin/rules");
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Rules");
    await expectNoSeriousViolations(page, "/admin/rules");
    const days = page.getByLabel(/Days before expiry/);
    await days.fill("30, 7, 7");
    await page.getByRole("button", { name: "Adopt the schedule" }).click();
    await expect.poll(() => page.getByText("Each day may appear once.").first().isVisible()).toBe(true);
    // The default schedule again (a new version that changes nothing for other tests).
    await days.fill("0, 1, 7, 30");
    await page.getByRole("button", { name: "Adopt the schedule" }).click();
    await expect.poll(() => page.getByRole("status").first().textContent()).toMatch(/Version \d+ adopted/);
    await context.close();
  });
});

async function reload(id: string) {
  const [row] = await getDb().select().from(applications).where(eq(applications.id, id));
  return row;
}
