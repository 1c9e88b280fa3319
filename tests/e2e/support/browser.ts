// Browser tests drive Debian's Chromium (/usr/bin/chromium, installed by scripts/test.mjs) with
// playwright-core against the production build that `npm test` serves. Never a downloaded browser.
import fs from "node:fs";
import path from "node:path";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { baseUrl } from "../../support/http";

export const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

export async function launchBrowser(): Promise<Browser> {
  if (!fs.existsSync(CHROMIUM))
    throw new Error(`${CHROMIUM} is missing: run the tests with \`npm test\`, which installs it.`);
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

export async function newContext(browser: Browser, viewport = { width: 1280, height: 900 }): Promise<BrowserContext> {
  const context = await browser.newContext({ baseURL: baseUrl(), viewport });
  context.setDefaultTimeout(15_000);
  return context;
}

/** Signs in through the real sign-in form. */
export async function signInWithForm(page: Page, email: string, password: string): Promise<void> {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
}

/** Runs axe-core (injected from node_modules) and returns the serious and critical violations. */
export async function seriousA11yViolations(
  page: Page,
  options: { iframes?: boolean } = {},
): Promise<{ id: string; impact: string; help: string; nodes: number }[]> {
  const source = fs.readFileSync(path.resolve("node_modules/axe-core/axe.min.js"), "utf8");
  await page.addScriptTag({ content: source });
  // axe waits for every frame; a sandboxed frame (the caught-mail preview) never answers it.
  const iframes = options.iframes ?? true;
  const result = await page.evaluate(async (checkFrames) => {
    const axe = (
      window as unknown as {
        axe: {
          run: (
            ctx: Document,
            opts: object,
          ) => Promise<{ violations: { id: string; impact: string; help: string; nodes: unknown[] }[] }>;
        };
      }
    ).axe;
    return axe.run(document, { resultTypes: ["violations"], iframes: checkFrames });
  }, iframes);
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.length }));
}
