import { eq } from "drizzle-orm";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { mailOutbox, permits, type Department, type User } from "@/db/schema";
import { runReminders } from "@/lib/jobs/actions";
import { instantAt } from "@/lib/jobs/clock";
import { decide } from "@/lib/review/decide";
import { DEFAULT_AUDIENCE_RULES } from "@/lib/rules/chain";
import { reminderKey } from "@/lib/jobs/reminders";
import { deliverDueMail } from "@/lib/mail/actions";
import { addDays, todayIn } from "@/lib/permits/dates";
import { isoDayFromNow, pngBytes } from "../applications/support";
import { caughtTo, createPermitFixture, outboxRowsTo, useTimeZone, waitFor } from "../jobs/support";
import { asActor, createSubmittedApplication } from "../review/support";
import { createDepartment, createUser, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { randomIp } from "../support/http";
import { launchBrowser, newContext, signInWithForm } from "./support/browser";
import {
  applicationRow,
  axeLog,
  expectAccessible,
  focusIsVisible,
  invitationUrl,
  pdfText,
  permitForApplication,
  screenshot,
} from "./support/journey";

requireDatabase();

// The whole job as its users live it, in one real browser against the production build: an admin
// invites an instructor, who sets a password, registers a tier-2 apparatus and files an outreach
// application from it with a photo; the department's reviewer returns it, the instructor revises,
// the reviewer recommends and the safety officer approves with their password; the instructor
// downloads the permit; its QR page shows it active on a phone, then revoked once the officer
// revokes it; and the daily job's reminder mail reaches the local inbox once when the clock is moved.
// Every page is checked with axe-core; screenshots of the main screens go to .data/screenshots/.

/** The desktop size the screenshots are taken at, and a common 6.1-inch phone screen in CSS pixels. */
const DESKTOP = { width: 1280, height: 800 };
const PHONE = { width: 390, height: 844 };

async function stepHeading(page: Page) {
  return (await page.getByTestId("step-heading").textContent())?.trim();
}

/**
 * Waits until the instructor is told that revision `revision` was submitted. The form shows its
 * confirmation and then calls router.refresh(); on /applications/[id]/edit that re-renders the edit
 * page, which redirects a no-longer-editable application to its read page. Depending on timing the
 * confirmation is replaced by that page, whose header names the submitted revision instead.
 */
async function expectSubmitted(page: Page, applicationId: string, revision: number) {
  await expect
    .poll(
      async () => {
        const confirmation = page.getByTestId("submitted");
        if (await confirmation.isVisible().catch(() => false)) {
          const text = (await confirmation.textContent({ timeout: 1000 }).catch(() => "")) ?? "";
          if (text.includes(`Revision ${revision} was submitted`)) return "confirmation";
        }
        if (new URL(page.url()).pathname === `/applications/${applicationId}`) {
          const header =
            (await page
              .locator("main")
              .textContent({ timeout: 1000 })
              .catch(() => "")) ?? "";
          if (header.includes(`revision ${revision}, submitted`)) return "read page";
        }
        return "waiting";
      },
      { timeout: 20_000 },
    )
    .not.toBe("waiting");
}

async function next(page: Page, to: string, heading: string) {
  await page.getByRole("button", { name: `Next: ${to}` }).click();
  await expect.poll(() => stepHeading(page)).toBe(heading);
}

describe("the whole job, from invitation to reminder, in a real browser", () => {
  let browser: Browser;
  let started = 0;
  const contexts: BrowserContext[] = [];
  // Shared by the steps, in order.
  let admin: User;
  let reviewer: User;
  let officer: User;
  let dept: Department;
  const instructorEmail = `${uniq("instructor")}@example.test`;
  const instructorName = "Ines Calloway";
  const instructorPassword = "Copper-sphere lantern 47 harbour";
  const apparatusName = "Belt-charged sphere generator with spark gap";
  const eventTitle = "Science night in the atrium";
  let instructor: Page;
  let applicationId = "";
  let permitId = "";
  let permitNumber = "";
  let verificationCode = "";
  let phone: Page;

  /** The steps share state: a step whose predecessor did not finish says so instead of failing obscurely. */
  function needs(value: unknown, what: string): void {
    if (!value) throw new Error(`an earlier step did not finish: ${what} is missing`);
  }

  async function page(viewport = DESKTOP): Promise<Page> {
    const context = await newContext(browser, viewport);
    contexts.push(context);
    return context.newPage();
  }

  beforeAll(async () => {
    started = Date.now();
    browser = await launchBrowser();
    dept = await createDepartment(uniq("Physics outreach"));
    const office = await createDepartment(uniq("Safety office"));
    [admin, reviewer, officer] = await Promise.all([
      createUser({ roles: ["admin"], departmentId: office.id, name: "Marta Oduya" }),
      createUser({ roles: ["reviewer"], departmentId: dept.id, name: "Tobias Renn" }),
      createUser({ roles: ["safety_officer"], departmentId: office.id, name: "Hana Velde" }),
    ]);
  });

  afterAll(async () => {
    for (const c of contexts) await c.close().catch(() => undefined);
    await browser?.close();
    // Later test files' recommendations would mail this officer; the account ends with the suite.
    if (officer) {
      const { users } = await import("@/db/schema");
      await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, officer.id));
    }
    const seconds = ((Date.now() - started) / 1000).toFixed(1);
    console.log(`[journey] the whole journey took ${seconds} s`);
    console.log(
      `[journey] axe (serious + critical violations per page): ${axeLog.map((a) => `${a.where}: ${a.violations}`).join("; ")}`,
    );
  });

  it("1. the admin invites an instructor, who opens the link and sets a password", { timeout: 90_000 }, async () => {
    const adminPage = await page();
    await signInWithForm(adminPage, admin.email, TEST_PASSWORD);
    await adminPage.goto("/admin/users");
    await expectAccessible(adminPage, "/admin/users");
    const invite = adminPage
      .locator("form")
      .filter({ has: adminPage.getByRole("button", { name: "Send invitation" }) });
    await invite.getByLabel("Name").fill(instructorName);
    await invite.getByLabel("E-mail").fill(instructorEmail);
    // Instructor is the form's default role.
    expect(await invite.getByLabel("Instructor").isChecked()).toBe(true);
    await invite.getByLabel("Department").selectOption({ label: dept.name });
    await adminPage.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(() => adminPage.getByText(`Invitation sent to ${instructorEmail}`).isVisible()).toBe(true);
    await expectAccessible(adminPage, "/admin/users after inviting");

    const url = await invitationUrl(instructorEmail);
    instructor = await page();
    await instructor.goto(url);
    await expectAccessible(instructor, "/invite/[token]");
    await instructor.getByLabel("New password").fill(instructorPassword);
    await instructor.getByLabel("Repeat it").fill(instructorPassword);
    // Keyboard only: Tab reaches the primary button, which shows its focus, and Enter submits.
    await instructor.keyboard.press("Tab");
    await expect
      .poll(() => instructor.evaluate(() => document.activeElement?.textContent?.trim()))
      .toBe("Set password and sign in");
    expect(await focusIsVisible(instructor), "the focused button shows a focus indicator").toBe(true);
    await instructor.keyboard.press("Enter");
    await instructor.waitForURL((u) => u.pathname === "/", { timeout: 15_000 });
    await expect.poll(() => instructor.getByRole("heading", { level: 1 }).isVisible()).toBe(true);
    await expectAccessible(instructor, "/ (instructor dashboard, new account)");
  });

  it(
    "2. the instructor registers a tier-2 apparatus and files an outreach application from it",
    {
      timeout: 180_000,
    },
    async () => {
      needs(instructor, "the signed-in instructor (step 1)");
      await instructor.goto("/apparatus/new");
      await expectAccessible(instructor, "/apparatus/new");
      await instructor.getByLabel("Name").fill(apparatusName);
      await instructor.getByLabel("Room").fill("Atrium, north bench");
      await instructor.getByLabel("Notes").fill("Stored in cabinet 4; belt replaced this term.");
      await instructor.getByLabel("Capacitance of one unit").fill("4.7 nF");
      await instructor.getByLabel("Charging voltage of the bank").fill("30 kV");
      await instructor.getByLabel("Bleeder resistor across the bank").fill("100 MΩ");
      // 4.7 nF at 30 kV: E = ½ · 4.7 nF · (30 kV)² = 2.115 J ≥ 0.25 J → tier 2 (hazard-model.md table).
      await expect.poll(() => instructor.getByTestId("live-tier").textContent()).toContain("Tier 2 · Reflex injury");
      await instructor.getByRole("button", { name: "Register apparatus" }).click();
      await instructor.waitForURL(/\/apparatus\/[0-9a-f-]{36}$/);
      await expect.poll(() => instructor.getByRole("heading", { level: 1 }).textContent()).toBe(apparatusName);
      await expectAccessible(instructor, "/apparatus/[id]");
      await screenshot(instructor, "apparatus-detail");

      await instructor.getByRole("link", { name: "Use in an application" }).click();
      await instructor.waitForURL(/\/applications\/new\?apparatus=/);
      expect(await stepHeading(instructor)).toBe("Step 1 of 6: Event");
      await instructor.getByLabel("Title").fill(eventTitle);
      await instructor.getByLabel("Kind of event").selectOption("outreach_event");
      expect(await instructor.getByLabel("Room or place").inputValue()).toBe("Atrium, north bench");
      await instructor.getByLabel("Members of the public").check();
      await instructor.getByLabel("Audience size").fill("60");
      await instructor.getByLabel("First day").fill(isoDayFromNow(21));
      await instructor.getByLabel("Last day").fill(isoDayFromNow(21));
      expect(await instructor.getByLabel("Responsible person").inputValue()).toBe(instructorName);
      await instructor.getByRole("button", { name: "Add operator" }).click();
      await instructor.getByLabel("Operator 1").fill("Opal Fenwick");
      await instructor.getByLabel("Trained and current on this apparatus").check();
      await expectAccessible(instructor, "application step 1");
      await next(instructor, "Apparatus", "Step 2 of 6: Apparatus");
      await expect.poll(() => new URL(instructor.url()).pathname).toMatch(/^\/applications\/[0-9a-f-]{36}\/edit$/);
      applicationId = new URL(instructor.url()).pathname.split("/")[2];

      // The registry record's set-up, as typed, with the live figures beside it.
      await expect.poll(() => instructor.getByLabel("Capacitance of one unit").inputValue()).toBe("4.7 nF");
      await expect.poll(() => instructor.getByTestId("live-tier").textContent()).toContain("Tier 2 · Reflex injury");
      // 2.115 J is 2.11499… in binary floating point: three significant digits show 2.11 J.
      expect(await instructor.getByTestId("live-figures").locator('[data-figure="Energy"]').textContent()).toBe(
        "2.11 J",
      );
      await expectAccessible(instructor, "application step 2");
      await screenshot(instructor, "application-step-2-live-figures");

      await next(instructor, "Hazard result", "Step 3 of 6: Hazard result");
      expect(await instructor.getByTestId("tier-result").textContent()).toContain("Tier 2 · Reflex injury");
      expect(await instructor.getByRole("note", { name: "About these figures" }).isVisible()).toBe(true);
      await expectAccessible(instructor, "application step 3");
      await screenshot(instructor, "application-step-3-hazard-result");

      await next(instructor, "Controls", "Step 4 of 6: Controls");
      const boxes = instructor.locator("[data-control] input[type=checkbox]");
      // Tier 2 requires eight controls (hazard-model.md: five from tier 1, three from tier 2).
      expect(await boxes.count()).toBe(8);
      for (let i = 0; i < 8; i++) await boxes.nth(i).check();
      await expectAccessible(instructor, "application step 4");

      await next(instructor, "Attachments", "Step 5 of 6: Attachments");
      await instructor
        .getByLabel("Add photos or schematics")
        .setInputFiles({ name: "atrium-bench.png", mimeType: "image/png", buffer: pngBytes(40, 30) });
      await expect.poll(() => instructor.getByAltText("Thumbnail of atrium-bench.png").isVisible()).toBe(true);
      await expectAccessible(instructor, "application step 5");

      await next(instructor, "Review and attest", "Step 6 of 6: Review and attest");
      await instructor.getByLabel(/I confirm that this application describes the set-up/).check();
      await expectAccessible(instructor, "application step 6");
      await instructor.getByRole("button", { name: "Submit for review" }).click();
      await expectSubmitted(instructor, applicationId, 1);

      const row = await applicationRow(applicationId);
      expect(row).toMatchObject({ state: "submitted", tier: 2, departmentId: dept.id });

      // The dashboard now lists it among the open applications.
      await instructor.goto("/");
      await expect.poll(() => instructor.getByRole("link", { name: eventTitle }).first().isVisible()).toBe(true);
      await expectAccessible(instructor, "/ (instructor dashboard)");
      await screenshot(instructor, "dashboard");
    },
  );

  it(
    "3. the reviewer returns it, the instructor revises, the reviewer recommends, the officer approves",
    {
      timeout: 180_000,
    },
    async () => {
      const reviewerPage = await page();
      await signInWithForm(reviewerPage, reviewer.email, TEST_PASSWORD);
      await reviewerPage.goto("/review");
      await expectAccessible(reviewerPage, "/review (reviewer)");
      await reviewerPage.getByRole("link", { name: eventTitle }).click();
      await reviewerPage.waitForURL(`**/applications/${applicationId}`);
      await expect.poll(() => reviewerPage.getByRole("heading", { level: 1 }).textContent()).toBe(eventTitle);
      await reviewerPage.getByLabel(/Return for changes/).check();
      await reviewerPage.getByLabel(/^Comment/).fill("Name a second trained person for an audience of sixty.");
      await reviewerPage.getByLabel("Pin the comment to").selectOption("event.operators");
      await expectAccessible(reviewerPage, "/applications/[id] with the decision panel");
      await screenshot(reviewerPage, "review-decision-panel");
      await reviewerPage.getByRole("button", { name: "Return to the applicant" }).click();
      await expect
        .poll(() => reviewerPage.getByRole("status").first().textContent())
        .toContain("Returned to the applicant");
      await expect.poll(async () => (await applicationRow(applicationId)).state).toBe("returned");

      // The instructor reads the comment on the application's page, then revises on the edit page.
      await instructor.goto(`/applications/${applicationId}`);
      await expect.poll(() => instructor.getByText("Name a second trained person").first().isVisible()).toBe(true);
      await expectAccessible(instructor, "/applications/[id] (returned, applicant)");
      await instructor.getByRole("link", { name: "Edit the application" }).click();
      await instructor.waitForURL(`**/applications/${applicationId}/edit`);
      await expect
        .poll(() => instructor.getByText(/Returned for changes: submitting makes revision 2/).isVisible())
        .toBe(true);
      await expectAccessible(instructor, "/applications/[id]/edit (returned)");
      if ((await stepHeading(instructor)) !== "Step 1 of 6: Event")
        await instructor.getByRole("button", { name: /Event \(go back to this step\)/ }).click();
      await expect.poll(() => stepHeading(instructor)).toBe("Step 1 of 6: Event");
      await instructor.getByRole("button", { name: "Add operator" }).click();
      await instructor.getByLabel("Operator 2").fill("Rowan Ashby");
      await instructor.getByTestId("operator-1").getByLabel("Trained and current on this apparatus").check();
      await next(instructor, "Apparatus", "Step 2 of 6: Apparatus");
      await next(instructor, "Hazard result", "Step 3 of 6: Hazard result");
      await next(instructor, "Controls", "Step 4 of 6: Controls");
      await next(instructor, "Attachments", "Step 5 of 6: Attachments");
      await next(instructor, "Review and attest", "Step 6 of 6: Review and attest");
      const attest = instructor.getByLabel(/I confirm that this application describes the set-up/);
      if (!(await attest.isChecked())) await attest.check();
      await instructor.getByRole("button", { name: "Submit for review" }).click();
      await expectSubmitted(instructor, applicationId, 2);
      expect((await applicationRow(applicationId)).state).toBe("submitted");

      // The reviewer sees what changed and recommends revision 2.
      await reviewerPage.goto(`/applications/${applicationId}`);
      await expect
        .poll(() => reviewerPage.getByRole("heading", { name: "Changes since revision 1" }).isVisible())
        .toBe(true);
      await expect.poll(() => reviewerPage.getByText("Rowan Ashby (trained)").first().isVisible()).toBe(true);
      await reviewerPage.getByLabel(/^Recommend/).check();
      await expectAccessible(reviewerPage, "/applications/[id] recommending");
      await reviewerPage.getByRole("button", { name: "Sign the recommendation" }).click();
      await expect
        .poll(() => reviewerPage.getByRole("status").first().textContent())
        .toContain("recommendation is signed");
      await expect.poll(async () => (await applicationRow(applicationId)).state).toBe("in_review");

      // The safety officer approves with the tier's condition and their password.
      const officerPage = await page();
      await signInWithForm(officerPage, officer.email, TEST_PASSWORD);
      await officerPage.goto("/review");
      await expectAccessible(officerPage, "/review (safety officer)");
      await officerPage.getByRole("link", { name: eventTitle }).click();
      await officerPage.waitForURL(`**/applications/${applicationId}`);
      // issue 20: nothing is chosen for the signer; the window offered is the event's one day.
      expect(await officerPage.locator('input[type="radio"]:checked').count()).toBe(0);
      await officerPage.getByLabel(/^Approve/).check();
      expect(await officerPage.getByLabel("Valid from").inputValue()).toBe(isoDayFromNow(21));
      expect(await officerPage.getByLabel("Valid to").inputValue()).toBe(isoDayFromNow(21));
      // Tier 2's one requirement in the default chain rules (lib/rules/chain.ts).
      await officerPage.getByLabel("The named operator holds current training.").check();
      // Issue 20, item 9: sixty members of the public add the audience controls of the default rules.
      for (const rule of DEFAULT_AUDIENCE_RULES) await officerPage.getByLabel(rule.text).check();
      await officerPage.getByRole("textbox", { name: /^Your password/ }).fill(TEST_PASSWORD);
      await expectAccessible(officerPage, "/applications/[id] approving");
      await officerPage.getByRole("button", { name: "Sign and approve" }).click();
      await expect
        .poll(() => officerPage.getByRole("status").first().textContent())
        .toMatch(/Permit [A-Z][A-Z0-9]{0,5}-\d{4}-\d{4} is issued/);
      await expectAccessible(officerPage, "/applications/[id] approved");

      const permit = await permitForApplication(applicationId);
      expect(permit).toMatchObject({
        state: "active",
        tier: 2,
        // Tier 2's requirement, then the audience's: sixty members of the public (issue 20, item 9).
        conditions: ["The named operator holds current training.", ...DEFAULT_AUDIENCE_RULES.map((r) => r.text)],
        // The outreach evening's one day, not the tier's 180 days (issue 20).
        validFrom: isoDayFromNow(21),
        validTo: isoDayFromNow(21),
      });
      permitId = permit.id;
      permitNumber = permit.number;
    },
  );

  it("4. the instructor opens the permit and downloads its PDF", { timeout: 60_000 }, async () => {
    needs(permitId, "the issued permit (step 3)");
    await instructor.goto(`/permits/${permitId}`);
    await expect.poll(() => instructor.getByRole("heading", { level: 1 }).textContent()).toBe(permitNumber);
    await expect
      .poll(() => instructor.locator("main").getByText("Active", { exact: true }).first().isVisible())
      .toBe(true);
    expect(await instructor.getByRole("note", { name: "About these figures" }).first().isVisible()).toBe(true);
    // Issue 20, item 9: the audience's controls are conditions of the permit (sixty members of the public).
    const conditions = (await instructor.getByTestId("permit-conditions").textContent()) ?? "";
    for (const rule of DEFAULT_AUDIENCE_RULES) expect(conditions).toContain(rule.text);
    await expectAccessible(instructor, "/permits/[id]");
    await screenshot(instructor, "permit");

    const [download] = await Promise.all([
      instructor.waitForEvent("download"),
      instructor.getByRole("link", { name: "Printable PDF" }).click(),
    ]);
    expect(download.suggestedFilename()).toBe(`${permitNumber}.pdf`);
    const file = await download.path();
    const fs = await import("node:fs");
    const bytes = fs.readFileSync(file!);
    expect(bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(pdfText(bytes)).toContain(permitNumber);
    const res = await instructor.request.get(`/permits/${permitId}/pdf`);
    expect(res.status()).toBe(200);
    expect(res.headers()["content-type"]).toBe("application/pdf");

    // The QR code's address, as the permit page links it.
    const href = await instructor.getByRole("link", { name: "Public status page" }).getAttribute("href");
    expect(href).toMatch(/^\/verify\/[A-Za-z0-9_-]+$/);
    verificationCode = href!.split("/").pop()!;
    const [row] = await getDb()
      .select({ code: permits.verificationCode })
      .from(permits)
      .where(eq(permits.id, permitId));
    expect(verificationCode).toBe(row.code);
  });

  it("5. the QR code's page shows the permit active on a phone, without signing in", { timeout: 60_000 }, async () => {
    needs(verificationCode, "the permit's verification code (step 4)");
    phone = await page(PHONE);
    // A fresh client address, as a phone behind the institution's proxy would have.
    await phone.context().setExtraHTTPHeaders({ "x-forwarded-for": randomIp() });
    await phone.goto(`/verify/${verificationCode}`);
    expect(await phone.getByRole("heading", { level: 1 }).textContent()).toBe("Active");
    expect(await phone.getByText(permitNumber).first().isVisible()).toBe(true);
    // What the printed permit says about the event: the apparatus, its day and its audience.
    const facts = (await phone.locator("main dl").textContent()) ?? "";
    expect(facts).toContain(apparatusName);
    expect(facts).toContain("60 members of the public");
    expect(await phone.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width);
    await expectAccessible(phone, "/verify/[code] active (phone)");
    await screenshot(phone, "verify-phone");
  });

  it("6. the officer revokes the permit and the QR code's page says so", { timeout: 60_000 }, async () => {
    needs(phone, "the phone showing the verify page (step 5)");
    const officerPage = await page();
    await signInWithForm(officerPage, officer.email, TEST_PASSWORD);
    await officerPage.goto(`/permits/${permitId}`);
    await expect.poll(() => officerPage.getByRole("button", { name: "Revoke the permit" }).isVisible()).toBe(true);
    await expectAccessible(officerPage, "/permits/[id] (officer, revoke form)");
    await officerPage.getByLabel("Reason").fill("The atrium event moved to a room without a barrier.");
    await officerPage.getByRole("textbox", { name: /^Your password/ }).fill(TEST_PASSWORD);
    await officerPage.getByRole("button", { name: "Revoke the permit" }).click();
    await expect
      .poll(async () => {
        const [row] = await getDb().select({ state: permits.state }).from(permits).where(eq(permits.id, permitId));
        return row.state;
      })
      .toBe("revoked");
    await officerPage.reload();
    await expect
      .poll(() => officerPage.getByText("This permit no longer allows the set-up to be operated.").isVisible())
      .toBe(true);
    await expectAccessible(officerPage, "/permits/[id] revoked");

    await phone.reload();
    expect(await phone.getByRole("heading", { level: 1 }).textContent()).toBe("Revoked");
    await expectAccessible(phone, "/verify/[code] revoked (phone)");
    await screenshot(phone, "verify-phone-revoked");
  });

  it(
    "7. a still-active permit's reminder reaches the local inbox once when the clock is moved",
    { timeout: 60_000 },
    async () => {
      const restore = await useTimeZone("UTC");
      try {
        // The job runs as of a day when the permit has 7 days left, counting its last valid day
        // (lib/jobs/reminders.ts: "N days before" is due on validTo + 1 − N, so validTo − 6). The moved
        // clock stays at or before the real present so it never expires another test's permit early.
        const jobDay = addDays(todayIn("UTC", new Date()), -1);
        const jobNow = new Date(`${jobDay}T12:00:00Z`);
        const active = await createPermitFixture({ validFrom: addDays(jobDay, -60), validTo: addDays(jobDay, 6) });

        const first = await runReminders({ now: jobNow });
        expect(first.queued.filter((q) => q.permitId === active.permit.id).map((q) => q.kind)).toEqual(["7d"]);
        const second = await runReminders({ now: jobNow });
        expect(second.queued.filter((q) => q.permitId === active.permit.id)).toEqual([]);

        const rows = await outboxRowsTo([active.holder.email]);
        expect(rows.map((r) => r.kind)).toEqual(["permit_reminder"]);
        expect(rows[0].dedupeKey).toBe(
          `${reminderKey(active.permit.id, { kind: "7d", dueDate: jobDay })}:${active.holder.email.toLowerCase()}`,
        );
        await deliverDueMail({ limit: 10_000 });
        const caught = await waitFor(() =>
          caughtTo(active.holder.email).length > 0 ? caughtTo(active.holder.email) : null,
        );
        expect(caught).toHaveLength(1);
        expect(caught[0].subject).toBe(`Permit ${active.permit.number}: 7 days left`);
        expect(caught[0].text).toContain(`/permits/${active.permit.id}`);
        await waitFor(async () => {
          const [row] = await getDb().select().from(mailOutbox).where(eq(mailOutbox.id, rows[0].id));
          return row.status === "sent";
        });
        // Another run and another delivery round send nothing more.
        await runReminders({ now: jobNow });
        await deliverDueMail({ limit: 10_000 });
        expect(caughtTo(active.holder.email)).toHaveLength(1);
      } finally {
        await restore();
      }
    },
  );
  it(
    "8. an event-bound permit is valid for the event's day only, and its QR page says expired the day after",
    { timeout: 90_000 },
    async () => {
      const restore = await useTimeZone("UTC");
      try {
        // An evening event two days ahead; the daily job then runs as of the morning after it.
        const eventDay = addDays(todayIn("UTC", new Date()), 2);
        const holder = await createUser({ roles: ["instructor"], departmentId: dept.id, name: "Edda Marlow" });
        const title = "Spark gap evening for the public";
        const { application } = await createSubmittedApplication({
          applicant: holder,
          tier: 2,
          title,
          firstDay: eventDay,
          lastDay: eventDay,
          audience: "public",
          audienceSize: 80,
        });
        await decide(asActor(reviewer), application.id, { kind: "recommend", expectedVersion: application.version });

        const officerPage = await page();
        await signInWithForm(officerPage, officer.email, TEST_PASSWORD);
        await officerPage.goto(`/applications/${application.id}`);
        await officerPage.getByLabel(/^Approve/).check();
        expect(await officerPage.getByLabel("Valid from").inputValue()).toBe(eventDay);
        expect(await officerPage.getByLabel("Valid to").inputValue()).toBe(eventDay);
        await officerPage.getByLabel("The named operator holds current training.").check();
        for (const rule of DEFAULT_AUDIENCE_RULES) await officerPage.getByLabel(rule.text).check();
        await officerPage.getByRole("textbox", { name: /^Your password/ }).fill(TEST_PASSWORD);
        await officerPage.getByRole("button", { name: "Sign and approve" }).click();
        await expect.poll(async () => (await permitForApplication(application.id))?.state).toBe("active");
        const permit = await permitForApplication(application.id);
        expect(permit).toMatchObject({ validFrom: eventDay, validTo: eventDay, validityReason: null });

        const bench = await page(PHONE);
        await bench.context().setExtraHTTPHeaders({ "x-forwarded-for": randomIp() });
        await bench.goto(`/verify/${permit.verificationCode}`);
        expect(await bench.getByRole("heading", { level: 1 }).textContent()).toBe("Active");
        expect((await bench.locator("main dl").textContent()) ?? "").toContain("80 members of the public");

        // Move the clock as `npm run clock -- <day>` does: the daily job at 06:00 the day after the event.
        const report = await runReminders({ now: instantAt(addDays(eventDay, 1), "UTC", 6) });
        expect(report.expired).toContain(permit.id);
        await bench.reload();
        expect(await bench.getByRole("heading", { level: 1 }).textContent()).toBe("Expired");
        await expectAccessible(bench, "/verify/[code] expired (phone)");
      } finally {
        await restore();
      }
    },
  );
});
