// The tier thresholds' JSON bulk edit on /admin/rules (issue 18 item 3: "JSON import/export stays
// available"), which only a browser shows: the download is the set the form holds, a set pasted
// back loads into the form's rows and previews, and a set out of tier order is refused naming the
// threshold. Nothing is adopted here (the rules in force are shared by every test).
import fs from "node:fs";
import crypto from "node:crypto";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { TierRules } from "@/lib/hazard";
import { currentTierRuleSet } from "@/lib/rules/queries";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import { launchBrowser, newContext, signInWithForm } from "./support/browser";

requireDatabase();

describe("tier thresholds as JSON", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it(
    "downloads the form's set, loads an edited set into the rows, and refuses one out of order",
    { timeout: 60_000 },
    async () => {
      const admin = await createUser({ roles: ["admin"] });
      const inForce = (await currentTierRuleSet()).rules;
      const context = await newContext(browser);
      context.setDefaultTimeout(30_000);
      const page = await context.newPage();
      await signInWithForm(page, admin.email, TEST_PASSWORD);
      await page.goto("/admin/rules");
      await page.getByText("Bulk edit as JSON").click();

      // Export: the file holds every threshold of the set in force (the form is unchanged).
      const [download] = await Promise.all([
        page.waitForEvent("download"),
        page.getByRole("button", { name: "Download JSON" }).click(),
      ]);
      const exported = JSON.parse(fs.readFileSync((await download.path())!, "utf8")) as TierRules;
      expect(download.suggestedFilename()).toMatch(/^tier-thresholds-.+\.json$/);
      expect(exported.arc.energy.value).toBe(inForce.arc.energy.value);
      expect(exported.lethal).toEqual(inForce.lethal);
      expect(exported.controls).toEqual(inForce.controls);

      // Import: the arc-flash energy raised to 20 kJ (20 000 J in SI base units) comes back into its
      // row in SI notation (kilo = 10³, BIPM SI Brochure, 9th edition, table 7) and previews.
      const version = `aldermere-json-${crypto.randomBytes(3).toString("hex")}`;
      const edited = {
        ...exported,
        rulesVersion: version,
        arc: { ...exported.arc, energy: { ...exported.arc.energy, value: 20_000 } },
      };
      const box = page.getByLabel("Thresholds (JSON, SI base units)");
      await box.fill(JSON.stringify(edited));
      await page.getByRole("button", { name: "Load into the form" }).click();
      await page.getByText("Loaded into the form.").waitFor();
      expect(await page.locator('[data-threshold="arc.energy"] input').first().inputValue()).toBe("20 kJ");
      await page.getByTestId("preview-rules").click();
      const preview = page.getByTestId("rules-preview");
      await preview.waitFor();
      expect(await preview.textContent()).toContain(`→ ${version}`);

      // Out of tier order (a lethal energy below the heavy-shock 0.25 J): refused, the threshold named.
      const unordered = {
        ...exported,
        lethal: { ...exported.lethal, energy: { ...exported.lethal.energy, value: 0.1 } },
      };
      await box.fill(JSON.stringify(unordered));
      await page.getByRole("button", { name: "Load into the form" }).click();
      await page.getByText(/^rules\.lethal\.energy\.value: /).waitFor();
      // The rows still hold the loaded set.
      expect(await page.locator('[data-threshold="arc.energy"] input').first().inputValue()).toBe("20 kJ");
      expect((await currentTierRuleSet()).rules.rulesVersion).toBe(inForce.rulesVersion);
      await context.close();
    },
  );
});
