// Institutional sign-in in a real browser, through the local identity provider `npm test` runs
// (scripts/local-idp.mjs, the fictional Aldermere Institute's directory): a first sign-in, started from
// a page asked for while signed out, makes the account in the department the directory names and
// returns to that page; an admin gives it the safety officer's role in the product; the person signs
// in again and approves an application with a fresh institutional sign-in instead of a password;
// signing out ends the session at the provider too, so the next sign-in asks for the password there
// again; a disabled account is not let back in. Then a second server with password sign-in turned off: no password
// form, and its API refuses a password (also as the signature revoking a permit from an incident report).
import { and, eq, sql } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, decisions, departments, users } from "@/db/schema";
import { decide } from "@/lib/review/decide";
import { DEFAULT_AUDIENCE_RULES, DEFAULT_CHAIN_RULES } from "@/lib/rules/chain";
import { LOCAL_IDP_ACCOUNTS, LOCAL_IDP_PASSWORD } from "@/scripts/lib/local-idp-accounts.mjs";
import { asActor, createSubmittedApplication, createTeam } from "../review/support";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import { baseUrl, http, institutionSessionCookie, randomIp, signIn } from "../support/http";
import { startSecondServer, type SecondServer } from "../support/second-server";
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
      // Signed out, the person asks for a page with a query: sign-in first, then back to that page.
      const asked = "/search?q=Induction+coil";
      await page.goto(asked);
      await page.waitForURL((url) => url.pathname === "/sign-in" && url.searchParams.get("from") === asked);
      expect(await seriousA11yViolations(page)).toEqual([]);
      await page.getByRole("button", { name: "Sign in with your Aldermere account" }).click();
      await page.waitForURL((url) => url.port === process.env.TEST_OIDC_PORT);
      // What a page request answered after the sign-in started used to do (proxy.ts's session check
      // sets Auth.js's callback-URL cookie to the site's root when a request has none): the return
      // must not depend on that cookie.
      await context.addCookies([{ name: "authjs.callback-url", value: baseUrl(), url: baseUrl() }]);
      await page.getByLabel("Username").fill(noor.login);
      await page.getByLabel("Password").fill(LOCAL_IDP_PASSWORD);
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL((url) => url.pathname === "/search");
      expect(new URL(page.url()).search).toBe("?q=Induction+coil");
      expect(await page.getByRole("heading", { level: 1 }).textContent()).toMatch(/Search/);

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

      // Signing out ends the session at the provider too (RP-initiated logout): the next sign-in
      // asks for the institute password again instead of passing straight through.
      await page.getByRole("button", { name: "Sign out" }).click();
      await page.waitForURL((url) => url.origin === baseUrl() && url.pathname === "/sign-in");
      const endedAtProvider = await getDb()
        .select({ action: auditEvents.action })
        .from(auditEvents)
        .where(and(eq(auditEvents.entityId, account.id), eq(auditEvents.action, "session.signed_out")));
      expect(endedAtProvider).toHaveLength(1);

      // Disabled in the product meanwhile (that a live session ends at its next request is
      // tests/auth/institution-sign-in.test.ts's): the provider asks for the password again, and
      // vouching for the person no longer lets them in.
      const disable = await http(`/api/admin/users/${account.id}`, {
        method: "PATCH",
        cookie: adminCookie,
        body: { disabled: true },
      });
      expect(disable.status, disable.text).toBe(200);
      await signInThroughInstitute(page, { login: true });
      await page.waitForURL(/\/sign-in\?error=disabled/);
      expect(await page.getByText("This account is disabled.").isVisible()).toBe(true);
      await context.close();
    },
  );
});

describe("password sign-in turned off (PASSWORD_SIGN_IN=false), on a second server of the same build", () => {
  let browser: Browser;
  let second: SecondServer | undefined;
  beforeAll(async () => {
    [browser, second] = await Promise.all([launchBrowser(), startSecondServer({ PASSWORD_SIGN_IN: "false" })]);
  }, 120_000);
  afterAll(async () => {
    second?.stop();
    await browser?.close();
  });

  it("shows only the institution's button, and its API refuses a password and setting one", SLOW, async () => {
    const user = await createUser({ roles: ["instructor"] });
    const base = second!.base;
    const context = await browser.newContext({ baseURL: base });
    const page = await context.newPage();
    await page.goto("/sign-in");
    expect(await page.getByRole("button", { name: "Sign in with your Aldermere account" }).isVisible()).toBe(true);
    // No password form at all: no password box, no e-mail box, no plain "Sign in" button.
    expect(await page.locator('input[type="password"]').count()).toBe(0);
    expect(await page.getByLabel("E-mail").count()).toBe(0);
    expect(await page.getByRole("button", { name: "Sign in", exact: true }).count()).toBe(0);
    expect(await seriousA11yViolations(page)).toEqual([]);

    // A browser posting the form's request anyway (same origin, JSON): refused before any password check.
    const posted = await page.evaluate(async (email) => {
      const res = await fetch("/api/session", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ email, password: "correct horse battery staple 42" }),
      });
      return { status: res.status, body: await res.json() };
    }, user.email);
    expect(posted.status).toBe(403);
    expect(posted.body.error.message).toMatch(/Password sign-in is turned off/);
    expect((await context.cookies()).map((c) => c.name)).not.toContain("authjs.session-token");

    const accept = await page.evaluate(async () => {
      const res = await fetch("/api/invitations/accept", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ token: "x".repeat(43), password: "a long enough passphrase" }),
      });
      return res.status;
    });
    expect(accept).toBe(403);
    await context.close();
  });

  it("revokes a permit from an incident report by a fresh institutional sign-in, not a password", SLOW, async () => {
    const base = second!.base;
    const call = async (path: string, init: { method?: string; body?: unknown; cookie: string }) => {
      const res = await fetch(base + path, {
        method: init.method ?? "GET",
        headers: {
          origin: base,
          "x-forwarded-for": randomIp(),
          cookie: init.cookie,
          ...(init.body === undefined ? {} : { "content-type": "application/json" }),
        },
        body: init.body === undefined ? undefined : JSON.stringify(init.body),
        redirect: "manual",
      });
      return { status: res.status, text: await res.text() };
    };
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 0 });
    const permit = await permitForApplication(application.id);
    const reported = await call("/api/incidents", {
      method: "POST",
      cookie: await institutionSessionCookie(team.reviewer, Date.now()),
      body: {
        kind: "near_miss",
        summary: "Shorting stick left outside the barrier",
        description: "Found on the audience side after the show.",
        occurredAt: "2026-01-15T10:00",
        location: "B12 lecture theatre",
        injuries: false,
        permitId: permit.id,
      },
    });
    expect(reported.status, reported.text).toBe(201);
    const id = JSON.parse(reported.text).incident.id as string;
    // The officer has a Benchclear password, but passwords are off: signing needs a fresh sign-in.
    const stale = await institutionSessionCookie(team.officer, Date.now() - 6 * 60_000);
    const page = await call(`/incidents/${id}`, { cookie: stale });
    expect(page.status).toBe(200);
    expect(page.text).toContain("Confirm it is you with");
    expect(page.text).not.toMatch(/type="password"/);

    const url = `/api/incidents/${id}/revoke-permit`;
    const body = { expectedVersion: permit.version, reason: "Shorting stick out of reach (report)." };
    const withPassword = await call(url, { method: "POST", cookie: stale, body: { ...body, password: TEST_PASSWORD } });
    expect(withPassword.status, withPassword.text).toBe(422);
    expect(JSON.parse(withPassword.text).error.issues[0].path).toBe("password");
    const ok = await call(url, {
      method: "POST",
      cookie: await institutionSessionCookie(team.officer, Date.now()),
      body,
    });
    expect(ok.status, ok.text).toBe(200);
    expect(JSON.parse(ok.text).permit.state).toBe("revoked");
  });
});
