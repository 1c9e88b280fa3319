// Issue 20, items 3, 4, 8 and 9, from the side of the people who ran into them: a reviewer and a safety
// officer signing, a holder at the bench with a phone, an instructor typing a set-up. What each did in
// the browser and what they must see. (Items 2, 5, 6 and 7: forms-new-users.test.ts; item 1 and the
// event-bound permit: journey.test.ts, step 8.)
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { assessSetup, type SetupInput } from "@/lib/hazard";
import { decide } from "@/lib/review/decide";
import { adoptRuleSet } from "@/lib/rules/actions";
import { DEFAULT_AUDIENCE_RULES, DEFAULT_CHAIN_RULES } from "@/lib/rules/chain";
import { useTimeZone } from "../jobs/support";
import { asActor, createSubmittedApplication, createTeam, resubmit } from "../review/support";
import { createRoleSet, requireDatabase, TEST_PASSWORD } from "../support/db";
import { randomIp } from "../support/http";
import { launchBrowser, newContext, signInWithForm } from "./support/browser";
import { pdfText, permitForApplication } from "./support/journey";

requireDatabase();

const PHONE = { width: 390, height: 844 };
// Each test takes a few seconds on an idle machine; the limit allows for a busy shared one.
const SLOW = { timeout: 120_000 };

/** Is the focused element on screen (not 760 px above it)? */
async function focusedOnScreen(page: Page): Promise<{ tag: string; label: string; onScreen: boolean }> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el || el === document.body) return { tag: "body", label: "", onScreen: false };
    const box = el.getBoundingClientRect();
    const label = (el as HTMLInputElement).labels?.[0]?.textContent ?? el.textContent ?? "";
    return {
      tag: el.tagName.toLowerCase(),
      label: label.trim(),
      onScreen: box.bottom > 0 && box.top < window.innerHeight,
    };
  });
}

/** A tier-2 application the reviewer has recommended: waiting for the officer's approval. */
async function waitingForApproval(team: Awaited<ReturnType<typeof createTeam>>, extra: { title?: string } = {}) {
  const { application } = await createSubmittedApplication({
    applicant: team.instructor,
    tier: 2,
    title: extra.title ?? "Jars for the outreach evening",
    audience: "public",
    audienceSize: 80,
  });
  await decide(asActor(team.reviewer), application.id, { kind: "recommend", expectedVersion: application.version });
  return application;
}

describe("issue 20: signatures, the bench card and the small things", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  // Item 3: "Approve" was preselected, and a refused signature showed its error 760 px above the button.
  it(
    "the officer finds no decision chosen, and a refused signature takes them to its first problem",
    SLOW,
    async () => {
      const team = await createTeam();
      const application = await waitingForApproval(team);
      const context = await newContext(browser);
      context.setDefaultTimeout(45_000);
      const page = await context.newPage();
      await signInWithForm(page, team.officer.email, TEST_PASSWORD);
      await page.goto(`/applications/${application.id}`);
      const radios = page.getByRole("radio");
      expect(await radios.count()).toBeGreaterThan(1);
      for (const radio of await radios.all()) expect(await radio.isChecked()).toBe(false);

      // Signing with nothing chosen is refused, with the reason on screen.
      await page.getByRole("button", { name: "Sign", exact: true }).click();
      await expect.poll(() => page.getByText("Choose a decision.").isVisible()).toBe(true);

      await page.getByLabel(/^Approve/).check();
      await page.getByRole("textbox", { name: /^Your password/ }).fill(TEST_PASSWORD);
      await page.getByRole("button", { name: "Sign and approve" }).click();
      // The first unticked requirement is focused and on screen, so the click visibly did something.
      await expect.poll(async () => (await focusedOnScreen(page)).tag).toBe("input");
      const focused = await focusedOnScreen(page);
      expect(focused.onScreen).toBe(true);
      const first = DEFAULT_CHAIN_RULES.tiers[2].requirements[0];
      expect(focused.label).toContain(first.text);
      expect(await page.getByText("Confirm every requirement of this tier.").isVisible()).toBe(true);
      await context.close();
    },
  );

  // Item 4 and item 8 (times, apparatus on the status page), at the bench on a phone.
  it(
    "the holder at the bench finds the bench card in A4 and Letter, times in the institution's zone, and the status page names the apparatus",
    SLOW,
    async () => {
      const restore = await useTimeZone("Europe/Berlin");
      try {
        const team = await createTeam();
        const application = await waitingForApproval(team, { title: "Bench card evening" });
        const version = (await import("../review/support")).currentVersion;
        await decide(asActor(team.officer), application.id, {
          kind: "approve",
          expectedVersion: await version(application.id),
          password: TEST_PASSWORD,
          // The tier's requirement and the audience's (80 members of the public).
          confirmedRequirements: [
            ...DEFAULT_CHAIN_RULES.tiers[2].requirements.map((r) => r.id),
            ...DEFAULT_AUDIENCE_RULES.map((r) => r.id),
          ],
          extraConditions: [],
        });
        const permit = await permitForApplication(application.id);
        expect(permit?.state).toBe("active");

        const context = await newContext(browser, PHONE);
        context.setDefaultTimeout(45_000);
        const page = await context.newPage();
        await signInWithForm(page, team.instructor.email, TEST_PASSWORD);
        await page.goto(`/permits/${permit.id}`);
        const a4 = page.getByRole("link", { name: "Bench card (A4)" });
        const letter = page.getByRole("link", { name: "Bench card (US Letter)" });
        expect(await a4.isVisible()).toBe(true);
        expect(await letter.isVisible()).toBe(true);
        // ISO 216: A4 is 210 × 297 mm = 595.28 × 841.89 pt; ANSI/ASME Y14.1: Letter is 8.5 × 11 in = 612 × 792 pt.
        for (const [link, box] of [
          [a4, /\/MediaBox \[0 0 595\.\d+ 841\.\d+\]/],
          [letter, /\/MediaBox \[0 0 612 792\]/],
        ] as const) {
          const res = await page.request.get((await link.getAttribute("href"))!);
          expect(res.status()).toBe(200);
          expect(res.headers()["content-type"]).toBe("application/pdf");
          expect((await res.body()).toString("latin1")).toMatch(box);
        }

        // Times: in Berlin, named. Central European Time is UTC+1 in winter and UTC+2 in summer (memory).
        const issued = new Date(permit.issuedAt);
        const issuedText = (await page.locator("main").textContent()) ?? "";
        expect(issuedText).toContain("Europe/Berlin");
        const berlinHour = new Intl.DateTimeFormat("en-GB", {
          timeZone: "Europe/Berlin",
          hour: "2-digit",
          minute: "2-digit",
          hourCycle: "h23",
        }).format(issued);
        expect(berlinHour).not.toBe(issued.toISOString().slice(11, 16));
        expect(issuedText).toContain(`${berlinHour} Europe/Berlin`);
        // Signatures keep the UTC time of the signed record beside it.
        expect(issuedText).toMatch(/\(\d{2}:\d{2}:\d{2} UTC\)/);

        // The QR code's page, read without signing in: the apparatus and the event, not only a number.
        const bench = await (await newContext(browser, PHONE)).newPage();
        await bench.context().setExtraHTTPHeaders({ "x-forwarded-for": randomIp() });
        await bench.goto(`/verify/${permit.verificationCode}`);
        const facts = (await bench.locator("main dl").textContent()) ?? "";
        expect(facts).toContain("Capacitor bank on the lecture bench");
        expect(facts).toContain("80 members of the public");
        await bench.context().close();
        await context.close();
      } finally {
        await restore();
      }
    },
  );

  // Item 8: the review view and its diff showed "sphere-terminal → custom-capacitance"; one attachment
  // was "480 B" to the instructor and "1 KiB" to the reviewer.
  it("the reviewer reads source kinds and attachment sizes as the instructor's form shows them", SLOW, async () => {
    const team = await createTeam();
    const setup: SetupInput = {
      sources: [
        { id: "C1", kind: "capacitor", capacitance_F: 0.5e-6, voltage_V: 1000, bleeder_ohm: 10e6 },
        { id: "Dome", kind: "sphere-terminal", radius_m: 0.1, voltage_V: 10e3 },
      ],
    };
    const { application } = await createSubmittedApplication({
      applicant: team.instructor,
      tier: assessSetup(setup).tier,
      setup,
    });
    await decide(asActor(team.reviewer), application.id, {
      kind: "return",
      expectedVersion: application.version,
      comment: "Give the dome as a measured capacitance.",
    });
    await resubmit(application, team.instructor, (content) => ({
      ...content,
      apparatus: {
        ...content.apparatus,
        setup: {
          ...content.apparatus.setup,
          sources: [
            content.apparatus.setup.sources[0],
            { id: "Dome", kind: "custom-capacitance", capacitance_F: 11e-12, voltage_V: 10e3 },
          ],
        },
      },
      attachments: [
        {
          id: "0b5e7c1e-3f64-4d0a-9d52-0c6f1f8e2a10",
          filename: "dome.png",
          contentType: "image/png",
          size_B: 480,
          sha256: "a".repeat(64),
        },
      ],
    }));

    const context = await newContext(browser);
    context.setDefaultTimeout(45_000);
    const page = await context.newPage();
    await signInWithForm(page, team.reviewer.email, TEST_PASSWORD);
    await page.goto(`/applications/${application.id}`);
    const main = (await page.locator("main").textContent()) ?? "";
    expect(main).not.toContain("sphere-terminal");
    expect(main).not.toContain("custom-capacitance");
    const change = page.locator("tr", { hasText: "Source 2 (Dome): Kind" });
    expect(await change.locator("del").textContent()).toBe("Sphere terminal");
    expect(await change.locator("ins").textContent()).toBe("Other capacitance");
    // 480 bytes is below 1000: shown in bytes, as the form's attachment list does (SI prefixes, common practice).
    expect(await page.locator("li", { hasText: "dome.png" }).textContent()).toContain("480 B");
    expect(main).not.toContain("KiB");
    await context.close();
  });

  // Item 9: 80 members of the public added no controls beyond the tier's.
  it("an audience control the admin adds is asked of the approver and printed on the permit", SLOW, async () => {
    const team = await createTeam();
    const set = await createRoleSet();
    const exit = "A second exit is kept clear for the audience throughout.";
    try {
      const context = await newContext(browser);
      context.setDefaultTimeout(45_000);
      const admin = await context.newPage();
      await signInWithForm(admin, set.admin.email, TEST_PASSWORD);
      await admin.goto("/admin/rules");
      const box = admin.getByTestId("audience-controls");
      // The defaults are there to edit: the public, or 50 people and more.
      expect(await box.getByLabel("Audience control 2").inputValue()).toBe(DEFAULT_AUDIENCE_RULES[1].text);
      await box.getByRole("button", { name: "Add audience control" }).click();
      const added = box.locator("li").nth(DEFAULT_AUDIENCE_RULES.length);
      await added.getByLabel(`Audience control ${DEFAULT_AUDIENCE_RULES.length + 1}`).fill(exit);
      await added.getByLabel("When members of the public attend").uncheck();
      await added.getByLabel("Or from this many people").fill("30");
      await admin.getByRole("button", { name: "Adopt as a new version" }).click();
      await expect.poll(() => admin.getByRole("status").first().textContent()).toMatch(/Version \d+ adopted/);

      // Forty students: none of the defaults (not the public, under 50), but the new control (30 and more).
      const { application } = await createSubmittedApplication({
        applicant: team.instructor,
        tier: 2,
        title: "Sparks for forty students",
        audience: "students",
        audienceSize: 40,
      });
      await decide(asActor(team.reviewer), application.id, {
        kind: "recommend",
        expectedVersion: application.version,
      });
      const officer = await (await newContext(browser)).newPage();
      officer.context().setDefaultTimeout(45_000);
      await signInWithForm(officer, team.officer.email, TEST_PASSWORD);
      await officer.goto(`/applications/${application.id}`);
      await officer.getByLabel(/^Approve/).check();
      for (const rule of DEFAULT_AUDIENCE_RULES) expect(await officer.getByLabel(rule.text).count()).toBe(0);
      await officer.getByLabel("The named operator holds current training.").check();
      await officer.getByRole("textbox", { name: /^Your password/ }).fill(TEST_PASSWORD);
      await officer.getByRole("button", { name: "Sign and approve" }).click();
      // Unconfirmed, it is refused and named; confirmed, it is a condition of the permit.
      await expect.poll(() => officer.getByText("Confirm every requirement of this tier.").isVisible()).toBe(true);
      await officer.getByLabel(exit).check();
      await officer.getByRole("button", { name: "Sign and approve" }).click();
      await expect.poll(async () => (await permitForApplication(application.id))?.state).toBe("active");
      const permit = await permitForApplication(application.id);
      expect(permit.conditions).toContain(exit);
      const res = await officer.request.get(`/permits/${permit.id}/pdf`);
      expect(res.status()).toBe(200);
      // Words the PDF breaks at a line end are joined again before reading.
      expect(
        pdfText(await res.body())
          .replace(/-\s*\n\s*/g, "")
          .replace(/\s+/g, " "),
      ).toContain("A second exit is kept clear");
      await officer.context().close();
      await context.close();
    } finally {
      // Later test files expect the built-in chain rules.
      await adoptRuleSet(asActor(set.admin), {
        kind: "chain",
        rules: DEFAULT_CHAIN_RULES,
        note: "back to the defaults",
      });
    }
  });

  // Item 8: a sphere terminal added to a set-up was labelled "C2". At the bench, on a phone.
  it("a source changed to a sphere terminal is labelled as one (a 390 px phone)", SLOW, async () => {
    const set = await createRoleSet();
    const context = await newContext(browser, PHONE);
    context.setDefaultTimeout(45_000);
    const page = await context.newPage();
    await signInWithForm(page, set.instructor.email, TEST_PASSWORD);
    await page.goto("/apparatus/new");
    await page.getByRole("button", { name: "Add energy source" }).click();
    const second = page.getByTestId("source-1");
    await second.getByLabel("Kind").selectOption("sphere-terminal");
    await expect.poll(() => second.getByLabel("Label").inputValue()).toBe("Terminal 2");
    // A label the user typed is theirs: changing the kind keeps it.
    await second.getByLabel("Label").fill("Dome");
    await second.getByLabel("Kind").selectOption("custom-capacitance");
    expect(await second.getByLabel("Label").inputValue()).toBe("Dome");
    await context.close();
  });

  // Item 8: the reminder setting said "0 = the day after" while its hint said "on the day the permit expires".
  it("the reminder setting says one thing about 0 days", SLOW, async () => {
    const set = await createRoleSet();
    const context = await newContext(browser);
    context.setDefaultTimeout(45_000);
    const page = await context.newPage();
    await signInWithForm(page, set.admin.email, TEST_PASSWORD);
    await page.goto("/admin/rules");
    const field = page.getByLabel(/^Days before expiry/);
    const hintId = (await field.getAttribute("aria-describedby"))!.split(" ")[0];
    const words = `${await page.locator(`label[for="${await field.getAttribute("id")}"]`).textContent()} ${await page
      .locator(`[id="${hintId}"]`)
      .textContent()}`;
    // lib/jobs/reminders.ts sends the 0-day reminder the day after the last valid day.
    expect(words).toContain("0 the day after");
    expect(words).not.toContain("on the day the permit expires");
    await context.close();
  });
});
