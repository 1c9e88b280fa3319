// Two flows of issue 17 in a real browser: a safety officer records a person's course with its
// certificate and the person finds it on their account page (item 1); the holder of an active permit
// meets "Apparatus changed since approval" after the apparatus was enlarged, with the field diff and
// the higher tier, and starts an amendment from it (item 4). The rules behind both (the approval gate,
// reminders, the change rows and e-mails) are tested over HTTP in tests/training and tests/rereview.
import { and, eq } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applications, courseTypes, trainingRecords } from "@/db/schema";
import type { SetupInput } from "@/lib/hazard";
import { pngBytes } from "../applications/support";
import { permitOverApparatus } from "../rereview/support";
import { createDepartment, createUser, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { http } from "../support/http";
import { launchBrowser, newContext, signInWithForm } from "./support/browser";

requireDatabase();

describe("people and the bench in the browser", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("an officer records a course with its certificate, and the person sees it on their account", async () => {
    const dept = await createDepartment();
    const officer = await createUser({ roles: ["safety_officer"], departmentId: dept.id });
    const person = await createUser({ roles: ["instructor"], departmentId: dept.id });
    const courseName = uniq("Capacitor-bank operator");
    await getDb()
      .insert(courseTypes)
      .values({ name: courseName, validityMonths: 24, minTier: 3, departmentId: dept.id });

    const context = await newContext(browser);
    const page = await context.newPage();
    await signInWithForm(page, officer.email, TEST_PASSWORD);
    await page.goto(`/training?person=${person.id}`);
    await page.getByRole("combobox", { name: /^Course/ }).selectOption({ label: `${courseName} (24 months)` });
    await page.getByLabel("Trainer").fill("Aldermere safety office");
    await page
      .getByLabel("Certificate")
      .setInputFiles({ name: "certificate.png", mimeType: "image/png", buffer: pngBytes(20, 14) });
    await page.getByRole("button", { name: "Record the course" }).click();
    await page.getByText("The course is recorded.").waitFor();

    // Stored with its certificate, recorded by the officer.
    const [record] = await getDb()
      .select()
      .from(trainingRecords)
      .where(and(eq(trainingRecords.userId, person.id), eq(trainingRecords.recordedById, officer.id)));
    expect(record?.trainer).toBe("Aldermere safety office");
    await page.goto(`/training?person=${person.id}`);
    await page.getByRole("link", { name: "certificate.png" }).waitFor();
    await context.close();

    const own = await newContext(browser);
    const personPage = await own.newPage();
    await signInWithForm(personPage, person.email, TEST_PASSWORD);
    await personPage.goto("/account");
    const table = personPage.getByRole("table", { name: "Your training" });
    await table.getByText(courseName).waitFor();
    // 24 months from the day it was completed (today): "current" until then.
    expect(await table.textContent()).toContain("certificate.png");
    await own.close();
  }, 60_000);

  it("the holder sees the apparatus change with its diff and higher tier, and starts an amendment", async () => {
    // A tier-1 apparatus (0.45 µF at 100 V) under an active tier-1 permit.
    const { team, cookie, name, apparatusId, permit } = await permitOverApparatus();

    // Enlarged to 1 µF at 10 kV: E = ½·C·V² = ½ × 1e-6 F × (1e4 V)² = 50 J by hand, at or above the
    // 10 J at ≥ 100 V line of tier 3 (LBNL Electrical Safety Manual's capacitor hazard classes, as
    // hazard-references.md cites them).
    const bigger: SetupInput = {
      sources: [{ id: "C1", kind: "capacitor", capacitance_F: 1e-6, voltage_V: 10_000, bleeder_ohm: 100e6 }],
    };
    const edited = await http(`/api/apparatus/${apparatusId}`, {
      method: "PATCH",
      cookie,
      body: { name, room: "B12", notes: "", setup: bigger, expectedRevision: 1 },
    });
    expect(edited.status, edited.text).toBe(200);

    const context = await newContext(browser);
    const page = await context.newPage();
    await signInWithForm(page, team.instructor.email, TEST_PASSWORD);
    await page.goto(`/permits/${permit.id}`);
    const banner = page.getByTestId("apparatus-changed");
    await banner.getByRole("heading", { name: "Apparatus changed since approval" }).waitFor();
    const diff = banner.getByRole("table", { name: "What changed since approval" });
    expect(await diff.locator("tbody tr").count()).toBeGreaterThan(0);
    expect(await banner.getByTestId("apparatus-changed-tier").textContent()).toContain(
      "Higher than the permit’s tier 1.",
    );

    await banner.getByRole("button", { name: "Start an amendment" }).click();
    await page.waitForURL(/\/applications\/[0-9a-f-]{36}\/edit/);
    const amendmentId = new URL(page.url()).pathname.split("/")[2];
    const [amendment] = await getDb()
      .select({ amends: applications.amendmentOfPermitId, state: applications.state, tier: applications.tier })
      .from(applications)
      .where(eq(applications.id, amendmentId));
    expect(amendment).toEqual({ amends: permit.id, state: "draft", tier: 3 });
    await context.close();
  }, 60_000);
});
