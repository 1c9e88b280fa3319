// Helpers for the whole-journey browser suite (tests/e2e/journey.test.ts): axe results kept per page
// for the closing summary, screenshots, and small waits on the database.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, desc, eq } from "drizzle-orm";
import type { Page } from "playwright-core";
import { expect } from "vitest";
import { getDb } from "@/db";
import { invitationToken, invitationUrl as linkForToken } from "@/lib/users/invitation-token";
import { applications, mailOutbox, permits } from "@/db/schema";
import { seriousA11yViolations } from "./browser";

// The journey's pictures go under .data, for a person to look at after a run. The committed pictures
// in docs/screenshots come from the demo story instead (tests/e2e/screenshots.test.ts, `npm run
// screenshots`), so no test-made name ever shows in the README.
export const SCREENSHOT_DIR = path.resolve(".data/screenshots");
export const DOCS_SCREENSHOT_DIR = path.resolve("docs/screenshots");

/** Every axe run of the journey: where, and how many serious or critical violations it found. */
export const axeLog: { where: string; violations: number }[] = [];

export async function expectAccessible(page: Page, where: string): Promise<void> {
  const violations = await seriousA11yViolations(page);
  axeLog.push({ where, violations: violations.length });
  expect(violations, `axe (serious, critical) on ${where}`).toEqual([]);
}

/** A screenshot of what is on screen (not the full page), kept in <dir>/<name>.png. */
export async function screenshot(page: Page, name: string, dir = SCREENSHOT_DIR): Promise<void> {
  fs.mkdirSync(dir, { recursive: true });
  // Fonts and images settle before the picture is taken.
  await page.evaluate(() => document.fonts.ready.then(() => undefined));
  await page.screenshot({ path: path.join(dir, `${name}.png`), fullPage: false });
}

export async function invitationUrl(email: string): Promise<string> {
  const [mail] = await getDb()
    .select({ data: mailOutbox.data })
    .from(mailOutbox)
    .where(and(eq(mailOutbox.toAddress, email), eq(mailOutbox.kind, "invitation")))
    .orderBy(desc(mailOutbox.id))
    .limit(1);
  expect(mail, `an invitation mail to ${email} is queued`).toBeDefined();
  // The row keeps the invitation's id, not the link; the link is rebuilt from it as the mail is.
  expect(mail.data).not.toHaveProperty("url");
  return linkForToken(invitationToken(String(mail.data.invitationId)));
}

export async function applicationRow(id: string) {
  const [row] = await getDb().select().from(applications).where(eq(applications.id, id));
  return row;
}

export async function permitForApplication(applicationId: string) {
  const [row] = await getDb().select().from(permits).where(eq(permits.applicationId, applicationId));
  return row;
}

/** The text of a PDF as poppler's pdftotext reads it. */
export function pdfText(bytes: Buffer): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "journey-pdf-"));
  const file = path.join(dir, "permit.pdf");
  try {
    fs.writeFileSync(file, bytes);
    return execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** Is the focused element drawn with a visible focus indicator (outline or ring)? */
export async function focusIsVisible(page: Page): Promise<boolean> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el || el === document.body) return false;
    const style = getComputedStyle(el);
    const outline = style.outlineStyle !== "none" && parseFloat(style.outlineWidth) > 0;
    const ring = style.boxShadow !== "none" && style.boxShadow !== "";
    return el.matches(":focus-visible") && (outline || ring);
  });
}
