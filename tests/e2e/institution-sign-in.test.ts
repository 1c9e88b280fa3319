// Institutional sign-in in a real browser, through the local identity provider `npm test` runs
// (scripts/local-idp.mjs, the fictional Aldermere Institute's directory): a first sign-in makes the
// account in the department the directory names; an admin gives it the safety officer's role in the
// product; the person signs in again and approves an application with a fresh institutional sign-in
// instead of a password; disabling the account in the product ends their access at the next request.
import { and, eq, sql } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, decisions, departments, users } from "@/db/schema";
import { decide } from "@/lib/review/decide";
import { DEFAULT_AUDIENCE_RULES, DEFAULT_CHAIN_RULES } from "@/lib/rules/chain";
import { LOCAL_IDP_ACCOUNTS, LOCAL_IDP_PASSWORD } from "@/scripts/lib/local-idp-accounts.mjs";
import { asActor, createSubmittedApplication, createTeam } from "../review/support";
import { createUser, requireDatabase } from "../support/db";
import { http, signIn } from "../support/http";
import { launchBrowser, newContext, seriousA11yViolations } from "./support/browser";
import { permitForApplication } from "./support/journey";

requireDatabase();

const SLOW = { timeout: 120_000 };
const noor = LOCAL_IDP_ACCOUNTS.find((a) => a.login === "nhalvorsen")!;

/** The department the directory names (code PHYS, as the demo data spells it), made once per database. */
async function physics() {
  await getDb()
    .insert(departments)
    .values({ name: "Department of Physics", code: noor.department })
    .onConflictDoNothing();
  const [row] = await getDb().select().from(departments).where(eq(departments.code, noor.department));
  return row;
}

/** Sign-in page → the provider's login page → back to Benchclear. `login` false: the provider still knows us. */
async function signInThroughInstitute(page: Page, options: { login: boolean }) {
  await page.getByRole("button", { name: "Sign in with your Aldermere account" }).click();
  if (options.login) {
    await page.waitForURL((url) => url.port === process.env.TEST_OIDC_PORT);
    await page.getByLabel("Username").fill(noor.login);
    await page.getByLabel("Password").fill(LOCAL_IDP_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
  }
}

describe("institutional sign-in through the local identity provider", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it(
    "provisions on first sign-in into the named department, then the person approves once made an officer, until disabled",
    SLOW,
    async () => {
      const dept = await physics();
      const team = await createTeam();
      const admin = await createUser({ roles: ["admin"] });
      const { application } = await createSubmittedApplication({
        applicant: team.instructor,
        tier: 2,
        title: "Induction coil for the open day",
        audience: "public",
        audienceSize: 40,
      });
      await decide(asActor(team.reviewer), application.id, { kind: "recommend", expectedVersion: application.version });

      const context = await newContext(browser);
      context.setDefaultTimeout(45_000);
      const page = await context.newPage();
      await page.goto("/sign-in");
      expect(await seriousA11yViolations(page)).toEqual([]);
      await signInThroughInstitute(page, { login: true });
      await page.waitForURL((url) => url.pathname === "/");
      await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Dashboard");

      // First sign-in: an account from the directory's claims, in Physics, with the default role.
      const [account] = await getDb()
        .select()
        .from(users)
        .where(eq(sql`lower(${users.email})`, noor.email));
      expect(account).toMatchObject({
        name: noor.name,
        departmentId: dept.id,
        roles: ["instructor"],
        oidcSubject: noor.sub,
      });
      expect(account.passwordHash).toBeNull();
      const provisioned = await getDb()
        .select({ action: auditEvents.action })
        .from(auditEvents)
        .where(and(eq(auditEvents.entityId, account.id), eq(auditEvents.action, "user.provisioned")));
      expect(provisioned).toHaveLength(1);

      // Roles stay the product's: the admin makes them a safety officer on the admin path.
      const adminCookie = await signIn(admin.email);
      const patch = await http(`/api/admin/users/${account.id}`, {
        method: "PATCH",
        cookie: adminCookie,
        body: { roles: ["safety_officer"] },
      });
      expect(patch.status, patch.text).toBe(200);

      // The role change ended the old session; signing in again needs no new login at the provider.
      await page.goto("/");
      await page.waitForURL(/\/sign-in/);
      await signInThroughInstitute(page, { login: false });
      await page.waitForURL((url) => url.pathname === "/");
      await page.goto(`/applications/${application.id}`);

      // The institutional sign-in a moment ago is fresh: the panel asks for no password.
      await page.getByLabel(/^Approve/).check();
      expect(await page.getByText(/You confirmed who you are through your Aldermere account/).isVisible()).toBe(true);
      expect(await page.getByRole("textbox", { name: /^Your password/ }).count()).toBe(0);
      const requirements = [...DEFAULT_CHAIN_RULES.tiers[2].requirements, ...DEFAULT_AUDIENCE_RULES];
      for (const r of requirements) await page.getByLabel(r.text).check();
      await page.getByRole("button", { name: "Sign and approve" }).click();
      await page.waitForURL(/signed=approve/);

      const permit = await permitForApplication(application.id);
      expect(permit?.state).toBe("active");
      const [approval] = await getDb()
        .select()
        .from(decisions)
        .where(and(eq(decisions.revisionId, permit.revisionId), eq(decisions.kind, "approve")));
      expect(approval.signerId).toBe(account.id);

      // Disabled in the product: the next request is signed out, and the provider cannot let them back in.
      const disable = await http(`/api/admin/users/${account.id}`, {
        method: "PATCH",
        cookie: adminCookie,
        body: { disabled: true },
      });
      expect(disable.status, disable.text).toBe(200);
      await page.goto("/");
      await page.waitForURL(/\/sign-in/);
      await signInThroughInstitute(page, { login: false });
      await page.waitForURL(/\/sign-in\?error=disabled/);
      expect(await page.getByText("This account is disabled.").isVisible()).toBe(true);
      await context.close();
    },
  );
});
