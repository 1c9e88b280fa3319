import { desc, eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applicationRevisions, applications, courseTypes } from "@/db/schema";
import { formatQuantity, type Assessment } from "@/lib/hazard";
import { isoDayFromNow, pngBytes } from "../applications/support";
import { createRoleSet, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { baseUrl, http, signIn } from "../support/http";
import { launchBrowser, newContext, seriousA11yViolations, signInWithForm } from "./support/browser";

requireDatabase();

async function expectNoSeriousViolations(page: Page, where: string) {
  expect(await seriousA11yViolations(page), `axe on ${where}`).toEqual([]);
}

async function stepHeading(page: Page) {
  return (await page.getByTestId("step-heading").textContent())?.trim();
}

async function waitSaved(page: Page) {
  await expect
    .poll(() => page.getByTestId("save-status").getAttribute("data-state"), { timeout: 10_000 })
    .toBe("saved");
}

const liveFigure = (page: Page, label: string) =>
  page.getByTestId("live-figures").locator(`[data-figure="${label}"]`).textContent();

describe("the six-step application form, in a real browser", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it(
    "an instructor fills the six steps in SI notation, sees the tier change live, attaches a photo and submits",
    { timeout: 240_000 },
    async () => {
      const set = await createRoleSet();
      // A course tier 2 requires in this department only (issue 17): the named operator has no record.
      const course = uniq("Capacitor-bank operator");
      await getDb()
        .insert(courseTypes)
        .values({ name: course, validityMonths: 24, minTier: 2, departmentId: set.dept.id });
      const context = await newContext(browser);
      const page = await context.newPage();
      await signInWithForm(page, set.instructor.email, TEST_PASSWORD);

      await page.goto("/applications/new");
      expect(await stepHeading(page)).toBe("Step 1 of 6: Event");
      await expectNoSeriousViolations(page, "step 1");

      // Moving on with an empty step shows the message next to the field and stays.
      await page.getByRole("button", { name: "Next: Apparatus" }).click();
      await expect.poll(() => page.getByText("Give the event a title (at least 3 characters).").isVisible()).toBe(true);
      expect(await page.getByLabel("Title").getAttribute("aria-invalid")).toBe("true");
      expect(await stepHeading(page)).toBe("Step 1 of 6: Event");

      await page.getByLabel("Title").fill("Spark gap and Leyden jar lecture");
      await page.getByLabel("Kind of event").selectOption("lecture_demonstration");
      await page.getByLabel("Room or place").fill("Lecture theatre B12");
      await page.getByLabel("Students").check();
      await page.getByLabel("Audience size").fill("120");
      await page.getByLabel("First day").fill(isoDayFromNow(14));
      await page.getByLabel("Last day").fill(isoDayFromNow(15));
      expect(await page.getByLabel("Responsible person").inputValue()).toBe(set.instructor.name);
      await page.getByRole("button", { name: "Add operator" }).click();
      await page.getByLabel("Operator 1").fill("Opal Fenwick");
      await page.getByLabel("Trained and current on this apparatus").check();
      await page.getByRole("button", { name: "Next: Apparatus" }).click();
      await expect.poll(() => stepHeading(page)).toBe("Step 2 of 6: Apparatus");
      // The first save created the draft: the address is now its edit page.
      await expect.poll(() => new URL(page.url()).pathname).toMatch(/^\/applications\/[0-9a-f-]{36}\/edit$/);
      const applicationId = new URL(page.url()).pathname.split("/")[2];

      await page.getByLabel("Apparatus name").fill("Leyden jar bank on the lecture bench");
      await page.getByRole("button", { name: "Add energy source" }).click();
      await page.getByLabel("Capacitance of one unit").fill("4.7 nF");
      await expect.poll(() => page.getByText("Reads as 4.70 nF").isVisible()).toBe(true);
      await page.getByLabel("Charging voltage of the bank").fill("10 kV");
      // 4.7 nF at 10 kV: Q = 47 µC > 45 µC, E = 0.235 J < 0.25 J → tier 1 (hazard-model.md table).
      await expect.poll(() => page.getByTestId("live-tier").textContent()).toContain("Tier 1 · Sting");
      await page.getByLabel("Charging voltage of the bank").fill("30 kV");
      // 4.7 nF at 30 kV: E = ½ · 4.7 nF · (30 kV)² = 2.115 J ≥ 0.25 J → tier 2.
      await expect.poll(() => page.getByTestId("live-tier").textContent()).toContain("Tier 2 · Reflex injury");
      // 2.115 J is 2.11499… in binary floating point: three significant digits show it as 2.11 J.
      expect(await liveFigure(page, "Energy")).toBe("2.11 J");
      // A mistyped prefix, mΩ for MΩ: (30 kV)² / 100 mΩ = 9 GW in the bleeder (engine "implausible"
      // flag). Next stops at step 2 and asks for the figure to be corrected or confirmed.
      await page.getByLabel("Bleeder resistor across the bank").fill("100 mΩ");
      await expect.poll(() => page.getByTestId("implausible-confirm").isVisible()).toBe(true);
      await page.getByRole("button", { name: "Next: Hazard result" }).click();
      await expect.poll(() => page.getByText(/confirm it is as intended before moving on/).isVisible()).toBe(true);
      expect(await stepHeading(page)).toBe("Step 2 of 6: Apparatus");
      // Confirming the named figure lets the user move on; then they go back and correct it.
      await page.getByLabel(/I have checked .*bleeder resistance: not mistyped/).check();
      await page.getByRole("button", { name: "Next: Hazard result" }).click();
      await expect.poll(() => stepHeading(page)).toBe("Step 3 of 6: Hazard result");
      await page.getByRole("button", { name: "Back", exact: true }).click();
      await expect.poll(() => stepHeading(page)).toBe("Step 2 of 6: Apparatus");
      await page.getByLabel("Bleeder resistor across the bank").fill("100 MΩ");
      await expect.poll(() => page.getByText("Reads as 100 MΩ").isVisible()).toBe(true);
      expect(await page.getByTestId("implausible-confirm").count()).toBe(0);
      await expectNoSeriousViolations(page, "step 2");

      // The live figures are the server's: POST /api/assess for the same set-up gives the same numbers.
      const assess = await page.request.post("/api/assess", {
        headers: { origin: baseUrl() },
        data: {
          sources: [{ id: "C1", kind: "capacitor", capacitance_F: 4.7e-9, voltage_V: 30_000, bleeder_ohm: 100e6 }],
        },
      });
      expect(assess.status()).toBe(200);
      const server = ((await assess.json()) as { assessment: Assessment }).assessment;
      expect(server.tier).toBe(2);
      expect(await liveFigure(page, "Energy")).toBe(formatQuantity(server.energy_J, "J"));
      expect(await liveFigure(page, "Highest voltage")).toBe(formatQuantity(server.maxVoltage_V, "V"));
      expect(await liveFigure(page, "Charge")).toBe(formatQuantity(server.charge_C, "C"));
      expect(await liveFigure(page, "Peak current")).toBe(formatQuantity(server.peakCurrent_A, "A"));
      expect(await liveFigure(page, "Time to safe")).toBe(formatQuantity(server.timeToSafe_s!, "s"));

      // Reopening resumes at the saved step with what was typed.
      await waitSaved(page);
      await page.reload();
      expect(await stepHeading(page)).toBe("Step 2 of 6: Apparatus");
      // The form fills its fields once it has hydrated.
      await expect.poll(() => page.getByLabel("Capacitance of one unit").inputValue()).toBe("4.7 nF");
      expect(await page.getByLabel("Charging voltage of the bank").inputValue()).toBe("30 kV");

      await page.getByRole("button", { name: "Next: Hazard result" }).click();
      await expect.poll(() => stepHeading(page)).toBe("Step 3 of 6: Hazard result");
      expect(await page.getByTestId("tier-result").textContent()).toContain("Tier 2 · Reflex injury");
      const energy = page.locator('details[data-figure="energy"]');
      await energy.locator("summary").click();
      expect(await energy.textContent()).toContain("E = ½·C·V²");
      expect(await energy.textContent()).toContain("Reached: ≥ 250 mJ → tier 2 (Reflex injury)");
      // v2: sources name the publication (issue 12), no longer a short label
      expect(await energy.textContent()).toMatch(/Source: Discharge of Capacitors/);
      expect(await page.getByRole("note", { name: "About these figures" }).isVisible()).toBe(true);
      await expectNoSeriousViolations(page, "step 3");

      await page.getByRole("button", { name: "Next: Controls" }).click();
      await expect.poll(() => stepHeading(page)).toBe("Step 4 of 6: Controls");
      // Tier 2 requires eight controls (hazard-model.md: five from tier 1, three from tier 2).
      const boxes = page.locator("[data-control] input[type=checkbox]");
      expect(await boxes.count()).toBe(8);
      await page.getByRole("button", { name: "Next: Attachments" }).click();
      await expect
        .poll(() =>
          page
            .getByText(/^Confirm this control:/)
            .first()
            .isVisible(),
        )
        .toBe(true);
      for (let i = 0; i < 8; i++) await boxes.nth(i).check();
      await page.getByLabel("Note on “Warning sign at the bench”").fill("Sign on the bench and at the door.");
      await expectNoSeriousViolations(page, "step 4");
      await page.getByRole("button", { name: "Next: Attachments" }).click();
      await expect.poll(() => stepHeading(page)).toBe("Step 5 of 6: Attachments");

      // A page renamed .png is refused with its reason; nothing else changes.
      await page.getByLabel("Add photos or schematics").setInputFiles({
        name: "renamed.png",
        mimeType: "image/png",
        buffer: Buffer.from("<!doctype html><html><script>alert(1)</script></html>"),
      });
      await expect.poll(() => page.getByText("renamed.png was not attached").isVisible()).toBe(true);
      expect(await page.getByText(/Only JPEG, PNG, WebP and PDF files can be attached/).isVisible()).toBe(true);
      await page
        .getByLabel("Add photos or schematics")
        .setInputFiles({ name: "bench.png", mimeType: "image/png", buffer: pngBytes(32, 24) });
      const thumbnail = page.getByAltText("Thumbnail of bench.png");
      await expect.poll(() => thumbnail.isVisible()).toBe(true);
      await expect.poll(() => thumbnail.evaluate((img) => (img as HTMLImageElement).naturalWidth)).toBe(32);
      await expectNoSeriousViolations(page, "step 5");

      await page.getByRole("button", { name: "Next: Review and attest" }).click();
      await expect.poll(() => stepHeading(page)).toBe("Step 6 of 6: Review and attest");
      expect(await page.locator("dd", { hasText: "Spark gap and Leyden jar lecture" }).isVisible()).toBe(true);
      expect(await page.getByText("bench.png").isVisible()).toBe(true);
      // Before submitting, the server's training check beside the operator: no account, no record.
      const training = page.getByTestId("submission-training");
      await expect.poll(() => training.textContent()).toContain("Opal Fenwick");
      expect(await training.textContent()).toContain(`${course}: not recorded`);
      await page.getByRole("button", { name: "Submit for review" }).click();
      await expect.poll(() => page.getByText("Confirm the attestation to submit.").isVisible()).toBe(true);
      await page.getByLabel(/I confirm that this application describes the set-up/).check();
      await expectNoSeriousViolations(page, "step 6");
      await page.getByRole("button", { name: "Submit for review" }).click();
      await expect.poll(() => page.getByTestId("submitted").isVisible(), { timeout: 15_000 }).toBe(true);
      expect(await page.getByTestId("submitted").textContent()).toContain("Revision 1 was submitted");
      // Issue 20, item 8: the line under the title says so too (it kept saying "draft").
      expect(await page.getByTestId("form-subtitle").textContent()).toContain("revision 1: submitted for review");
      await expectNoSeriousViolations(page, "the confirmation");

      const [row] = await getDb().select().from(applications).where(eq(applications.id, applicationId));
      expect(row).toMatchObject({ state: "submitted", tier: 2 });
      const [revision] = await getDb()
        .select()
        .from(applicationRevisions)
        .where(eq(applicationRevisions.applicationId, applicationId))
        .orderBy(desc(applicationRevisions.revision));
      const content = revision.content as {
        apparatus: { setup: { sources: { capacitance_F: number; voltage_V: number }[] } };
        attachments: { filename: string; contentType: string }[];
      };
      expect(content.apparatus.setup.sources[0]).toMatchObject({ capacitance_F: 4.7e-9, voltage_V: 30_000 });
      expect(content.attachments).toEqual([
        expect.objectContaining({ filename: "bench.png", contentType: "image/png" }),
      ]);
      expect(revision.assessment).toEqual(server);
      await context.close();
    },
  );

  it("keeps what was typed when a save fails or the draft was saved elsewhere", { timeout: 120_000 }, async () => {
    const set = await createRoleSet();
    const context = await newContext(browser);
    const page = await context.newPage();
    await signInWithForm(page, set.instructor.email, TEST_PASSWORD);
    await page.goto("/applications/new");
    await page.getByLabel("Title").fill("Belt generator for the open day");
    await waitSaved(page);
    const id = new URL(page.url()).pathname.split("/")[2];
    const titleOf = async () => {
      const [row] = await getDb()
        .select({ title: applications.title })
        .from(applications)
        .where(eq(applications.id, id));
      return row.title;
    };
    expect(await titleOf()).toBe("Belt generator for the open day");

    // The server cannot be reached: the status says so, the text stays, and it is saved once it can be.
    await page.route("**/api/applications/*/draft", (route) => route.abort("connectionrefused"));
    await page.getByLabel("Title").fill("Belt generator for the open day, hall 2");
    await expect
      .poll(() => page.getByTestId("save-status").textContent(), { timeout: 10_000 })
      .toBe("Not saved — retrying");
    expect(await page.getByLabel("Title").inputValue()).toBe("Belt generator for the open day, hall 2");
    await page.unroute("**/api/applications/*/draft");
    await waitSaved(page);
    expect(await titleOf()).toBe("Belt generator for the open day, hall 2");

    // Saved elsewhere meanwhile (another window): 409, then the user keeps their own text.
    const [row] = await getDb().select().from(applications).where(eq(applications.id, id));
    const elsewhere = await http(`/api/applications/${id}/draft`, {
      method: "PATCH",
      cookie: await signIn(set.instructor.email),
      body: { expectedVersion: row.version, step: 1, draft: { event: { title: "From another window" } } },
    });
    expect(elsewhere.status).toBe(200);
    await page.getByLabel("Title").fill("Belt generator for the open day, hall 3");
    await expect
      .poll(() => page.getByTestId("save-status").textContent(), { timeout: 10_000 })
      .toBe("Not saved — changed elsewhere");
    expect(await titleOf()).toBe("From another window");
    expect(await page.getByLabel("Title").inputValue()).toBe("Belt generator for the open day, hall 3");
    await expectNoSeriousViolations(page, "the conflict message");
    await page.getByRole("button", { name: "Save mine over it" }).click();
    await waitSaved(page);
    expect(await titleOf()).toBe("Belt generator for the open day, hall 3");
    await context.close();
  });

  it(
    "fetches the checks and later steps when first needed, says so while they download, and when they cannot",
    {
      timeout: 120_000,
    },
    async () => {
      // Issue 15's budget: step 1 loads without zod, the hazard engine and steps 2–6; they are fetched
      // after the first edit. Held here (every script chunk asked for once the page has loaded), so the
      // wait is long enough to be seen; then refused, as on a dropped connection.
      const set = await createRoleSet();
      const chunks = "**/_next/static/chunks/**";
      const context = await newContext(browser);
      let page = await context.newPage();
      await signInWithForm(page, set.instructor.email, TEST_PASSWORD);
      await page.goto("/applications/new");
      await page.waitForLoadState("networkidle");
      let release = () => {};
      const held = new Promise<void>((resolve) => (release = resolve));
      const asked: string[] = [];
      await page.route(chunks, async (route) => {
        asked.push(route.request().url());
        await held;
        await route.continue();
      });
      await page.getByLabel("Title").fill("Belt generator for the open day");
      await expect.poll(() => asked.length).toBeGreaterThan(0);
      await page.getByRole("button", { name: "Next: Apparatus" }).click();
      await expect.poll(() => page.getByText("Loading the checks for this step…").isVisible()).toBe(true);
      release();
      // The same messages as the server's schemas give, next to their fields.
      await expect.poll(() => page.getByText("Choose the kind of event.").isVisible()).toBe(true);
      expect(await page.getByText("Loading the checks for this step…").count()).toBe(0);
      expect(await stepHeading(page)).toBe("Step 1 of 6: Event");
      await page.close();

      // A new page (its own copy of the code, the same session).
      page = await context.newPage();
      await page.goto("/applications/new");
      await page.waitForLoadState("networkidle");
      await page.route(chunks, (route) => route.abort("connectionrefused"));
      await page.getByLabel("Title").fill("Belt generator for the open day");
      await page.getByRole("button", { name: "Next: Apparatus" }).click();
      await expect
        .poll(() => page.getByText(/This step could not be checked: the form's checks did not download/).isVisible(), {
          timeout: 10_000,
        })
        .toBe(true);
      expect(await stepHeading(page)).toBe("Step 1 of 6: Event");
      expect(await page.getByLabel("Title").inputValue()).toBe("Belt generator for the open day");
      await context.close();
    },
  );
});
