// /dev/mail in a real browser (Debian's Chromium) against the production build: an admin opens a
// caught message; its HTML part renders inside the sandboxed frame under the page's CSP without a
// single violation, and the page has no serious accessibility problems.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { getDb } from "@/db";
import { deliverDueMail } from "@/lib/mail/actions";
import { queueMail } from "@/lib/outbox";
import { outboxIdsTo } from "../jobs/support";
import { createUser, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { baseUrl } from "../support/http";
import { launchBrowser, newContext, seriousA11yViolations, signInWithForm } from "../e2e/support/browser";
import { caughtTo, createPermitFixture } from "../jobs/support";

requireDatabase();

describe("/dev/mail in a browser", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it(
    "shows a caught approval with its HTML in the sandboxed frame, no CSP violations, no serious a11y problems",
    { timeout: 90_000 },
    async () => {
      const admin = await createUser({ roles: ["admin"] });
      const f = await createPermitFixture({ validFrom: "2098-03-01", validTo: "2098-05-29" });
      const to = `${uniq("browser")}@example.test`;
      await getDb().transaction((tx) =>
        queueMail(tx, to, {
          kind: "application_approved",
          data: {
            applicationId: f.application.id,
            permitId: f.permit.id,
            permitNumber: f.permit.number,
            title: f.title,
            validFrom: f.permit.validFrom,
            validTo: f.permit.validTo,
          },
        }),
      );
      // Other test files leave mail queued in the shared outbox: send just this message.
      await deliverDueMail({ ids: await outboxIdsTo(to) });
      const [caught] = caughtTo(to);

      const context = await newContext(browser);
      const page = await context.newPage();
      const problems: string[] = [];
      page.on("console", (m) => {
        if (m.type() === "error") problems.push(m.text());
      });
      page.on("pageerror", (e) => problems.push(e.message));
      await signInWithForm(page, admin.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/dev/mail?id=${caught.id}`);
      await expect.poll(() => page.getByRole("heading", { name: caught.subject }).count()).toBe(1);

      const frame = page.frameLocator("iframe[sandbox]");
      await expect.poll(() => frame.getByRole("heading", { name: `Permit ${f.permit.number} issued` }).count()).toBe(1);
      await expect
        .poll(() => frame.getByRole("link", { name: "Open the permit" }).getAttribute("href"))
        .toBe(`${baseUrl()}/permits/${f.permit.id}`);
      expect(await page.getByText(`${f.permit.number}.ics`, { exact: false }).count()).toBeGreaterThan(0);
      expect(problems.filter((p) => /Content Security Policy|Refused to/i.test(p))).toEqual([]);
      // Frames are left out: axe would wait for a script inside the sandboxed mail frame that the
      // sandbox, rightly, never lets run.
      expect(await seriousA11yViolations(page, { iframes: false })).toEqual([]);
      await context.close();
    },
  );
});
