// Issue 14, production traps and account hardening: demo accounts and the local inbox refused under
// NODE_ENV=production, HSTS always sent, SMTP over TLS unless the relay is on this machine, password
// change throttled, sign-in / sign-out / failed sign-in in the audit trail, no role change to one's
// own account without a second admin, and no invitation token at rest in the outbox.
import { and, desc, eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { seedRefusal } from "@/scripts/demo-data";
import { getDb } from "@/db";
import { auditEvents, mailOutbox, users } from "@/db/schema";
import { checkCredentials } from "@/lib/auth/credentials";
import { DEMO_PASSWORD } from "@/lib/auth/demo";
import { hashPassword } from "@/lib/auth/password";
import { parseEnv } from "@/lib/env";
import { deliverDueMail } from "@/lib/mail/actions";
import { composeOutboxMail } from "@/lib/mail/compose";
import { beginDelivery, smtpSettingsFor, smtpSettingsFromEnv } from "@/lib/mail/transport";
import { RULES } from "@/lib/ratelimit";
import { inviteUser } from "@/lib/users/actions";
import { hashToken } from "@/lib/users/actions";
import { invitationToken } from "@/lib/users/invitation-token";
import { inboxPort } from "../jobs/support";
import { createRoleSet, createUser, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { http, randomIp, signIn } from "../support/http";

requireDatabase();

const base = {
  DATABASE_URL: "postgres://u:p@127.0.0.1:5432/benchclear",
  AUTH_SECRET: "x".repeat(32),
  DECISION_HMAC_KEY: "k".repeat(32),
};
const client = () => ({ ip: "192.0.2.44", knownDevice: false });

describe("production refuses the local demo's shortcuts", () => {
  it("refuses the local inbox under NODE_ENV=production, unless this is the local demo on a loopback APP_URL", () => {
    expect(() => parseEnv({ ...base, NODE_ENV: "production" })).toThrow(/MAIL_TRANSPORT must be smtp in production/);
    expect(() =>
      parseEnv({
        ...base,
        NODE_ENV: "production",
        BENCHCLEAR_LOCAL_DEMO: "1",
        APP_URL: "https://permits.aldermere.example",
      }),
    ).toThrow(/BENCHCLEAR_LOCAL_DEMO is only for the local demo/);
    expect(
      parseEnv({ ...base, NODE_ENV: "production", BENCHCLEAR_LOCAL_DEMO: "1", APP_URL: "http://127.0.0.1:3000" })
        .MAIL_TRANSPORT,
    ).toBe("local-inbox");
    expect(
      parseEnv({ ...base, NODE_ENV: "production", MAIL_TRANSPORT: "smtp", SMTP_HOST: "relay.aldermere.example" })
        .MAIL_TRANSPORT,
    ).toBe("smtp");
  });

  it("validates TRUSTED_PROXY_HOPS (default 0: the socket is the client)", () => {
    expect(parseEnv(base).TRUSTED_PROXY_HOPS).toBe(0);
    expect(parseEnv({ ...base, TRUSTED_PROXY_HOPS: "2" }).TRUSTED_PROXY_HOPS).toBe(2);
    expect(() => parseEnv({ ...base, TRUSTED_PROXY_HOPS: "-1" })).toThrow(/TRUSTED_PROXY_HOPS/);
    expect(() => parseEnv({ ...base, TRUSTED_PROXY_HOPS: "one" })).toThrow(/TRUSTED_PROXY_HOPS/);
  });

  it("refuses demo accounts' sign-in under production, by demo domain or by the published password", async () => {
    const production = { NODE_ENV: "production" as const, BENCHCLEAR_LOCAL_DEMO: false };
    const demo = await createUser({ roles: ["admin"], email: `${uniq("demo")}@benchclear.test` });
    expect(await checkCredentials(demo.email, TEST_PASSWORD, client(), production)).toEqual({
      ok: false,
      reason: "invalid",
    });
    // A renamed account that still has the published password is refused too.
    const renamed = await createUser({ roles: ["instructor"] });
    await getDb()
      .update(users)
      .set({ passwordHash: await hashPassword(DEMO_PASSWORD) })
      .where(eq(users.id, renamed.id));
    expect((await checkCredentials(renamed.email, DEMO_PASSWORD, client(), production)).ok).toBe(false);
    // The local demo (loopback APP_URL, BENCHCLEAR_LOCAL_DEMO) lets them in; so does development.
    const local = { NODE_ENV: "production" as const, BENCHCLEAR_LOCAL_DEMO: true };
    expect((await checkCredentials(renamed.email, DEMO_PASSWORD, client(), local)).ok).toBe(true);
    const dev = { NODE_ENV: "development" as const, BENCHCLEAR_LOCAL_DEMO: false };
    expect((await checkCredentials(demo.email, TEST_PASSWORD, client(), dev)).ok).toBe(true);
  });

  it("the demo data script refuses production and any database not on this machine without its override", () => {
    expect(seedRefusal({ NODE_ENV: "production", DATABASE_URL: base.DATABASE_URL })).toMatch(/NODE_ENV=production/);
    expect(seedRefusal({ NODE_ENV: "development", DATABASE_URL: "postgres://u:p@db.aldermere.example/bc" })).toMatch(
      /not on this machine/,
    );
    expect(seedRefusal({ NODE_ENV: "development", DATABASE_URL: "postgres://u:p@localhost:54329/bc" })).toBeNull();
    expect(seedRefusal({ NODE_ENV: "development", DATABASE_URL: "postgres://u:p@[::1]:54329/bc" })).toBeNull();
    expect(
      seedRefusal({
        NODE_ENV: "production",
        DATABASE_URL: "postgres://u:p@db.aldermere.example/bc",
        SEED_ALLOW_PRODUCTION: "1",
      }),
    ).toBeNull();
  });

  it("sends HSTS on every answer, whatever the build environment", async () => {
    // RFC 6797 §6.1: max-age in seconds; one year is the common practice value.
    for (const path of ["/sign-in", "/api/session"]) {
      const res = await http(path);
      expect(res.headers.get("strict-transport-security"), path).toBe("max-age=31536000; includeSubDomains");
    }
  });
});

describe("SMTP requires TLS unless the relay is on this machine", () => {
  const smtp = {
    MAIL_TRANSPORT: "smtp" as const,
    SMTP_PORT: 587,
    SMTP_SECURE: false,
    SMTP_USER: "u",
    SMTP_PASSWORD: "p",
  };

  it("requires STARTTLS for a relay elsewhere, implicit TLS when asked, plain only on loopback", () => {
    expect(smtpSettingsFor({ ...smtp, SMTP_HOST: "relay.aldermere.example" })).toMatchObject({
      requireTLS: true,
      ignoreTLS: false,
      secure: false,
    });
    expect(
      smtpSettingsFor({ ...smtp, SMTP_HOST: "relay.aldermere.example", SMTP_SECURE: true, SMTP_PORT: 465 }),
    ).toMatchObject({
      secure: true,
    });
    for (const host of ["127.0.0.1", "localhost", "::1"]) {
      expect(smtpSettingsFor({ ...smtp, SMTP_HOST: host }).requireTLS, host).toBe(false);
    }
  });

  it("a relay without STARTTLS is refused when TLS is required (nothing is sent in clear)", async () => {
    // The local inbox offers no STARTTLS (scripts/local-inbox.ts): with TLS required it must refuse.
    const settings = { ...smtpSettingsFromEnv(), port: inboxPort(), ignoreTLS: false, requireTLS: true };
    await expect(
      beginDelivery(
        settings,
        { from: "no-reply@benchclear.test", to: "x@example.test" },
        Buffer.from("Subject: x\r\n\r\nx"),
      ),
    ).rejects.toThrow();
  });
});

describe("accounts", () => {
  it(`throttles password change: ${RULES.passwordChange.limit} wrong current passwords, then 429`, async () => {
    const user = await createUser({ roles: ["instructor"] });
    const cookie = await signIn(user.email);
    const statuses: number[] = [];
    for (let i = 0; i <= RULES.passwordChange.limit; i++) {
      const res = await http("/api/me/password", {
        method: "POST",
        cookie,
        body: { currentPassword: `not it ${i}`, newPassword: "a long new passphrase 2026" },
      });
      statuses.push(res.status);
    }
    expect(statuses.slice(0, RULES.passwordChange.limit).every((s) => s === 422)).toBe(true);
    expect(statuses.at(-1)).toBe(429);
  });

  it("writes sign-in, failed sign-in and sign-out to the audit trail", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const ip = randomIp();
    const failed = await http("/api/session", {
      method: "POST",
      body: { email: user.email, password: "not the password" },
      headers: { "x-forwarded-for": ip },
    });
    expect(failed.status).toBe(401);
    const cookie = await signIn(user.email);
    expect((await http("/api/session", { method: "DELETE", cookie })).status).toBe(200);
    const rows = await getDb()
      .select({ action: auditEvents.action, actorId: auditEvents.actorId, data: auditEvents.data })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityType, "user"), eq(auditEvents.entityId, user.id)))
      .orderBy(auditEvents.id);
    expect(rows.map((r) => r.action)).toEqual(["session.sign_in_failed", "session.signed_in", "session.signed_out"]);
    expect(rows[0].data).toMatchObject({ email: user.email.toLowerCase(), ip });
    expect(rows[1].actorId).toBe(user.id);
    // A failed sign-in for an e-mail nobody has is recorded too.
    const ghost = `${uniq("ghost")}@example.test`;
    await http("/api/session", { method: "POST", body: { email: ghost, password: "whatever it is" } });
    const [ghostRow] = await getDb()
      .select({ action: auditEvents.action })
      .from(auditEvents)
      .where(eq(auditEvents.entityId, `email:${ghost}`));
    expect(ghostRow?.action).toBe("session.sign_in_failed");
  });

  it("an admin cannot change their own roles or department; a second admin can", async () => {
    const set = await createRoleSet();
    const other = await createUser({ roles: ["admin"] });
    const cookie = await signIn(set.admin.email);
    const self = await http(`/api/admin/users/${set.admin.id}`, {
      method: "PATCH",
      cookie,
      body: { roles: ["admin", "safety_officer"] },
    });
    expect(self.status).toBe(409);
    expect(self.json?.error.message).toMatch(/ask another admin/);
    const [unchanged] = await getDb().select({ roles: users.roles }).from(users).where(eq(users.id, set.admin.id));
    expect(unchanged.roles).toEqual(["admin"]);
    const otherCookie = await signIn(other.email);
    const byOther = await http(`/api/admin/users/${set.admin.id}`, {
      method: "PATCH",
      cookie: otherCookie,
      body: { roles: ["admin", "safety_officer"] },
    });
    expect(byOther.status).toBe(200);
    expect([...(byOther.json?.user.roles as string[])].sort()).toEqual(["admin", "safety_officer"]);
  });

  it("keeps no invitation token in the outbox, yet renders and re-renders the link from the invitation", async () => {
    const admin = await createUser({ roles: ["admin"] });
    const email = `${uniq("invitee")}@example.test`;
    const { invitation, token } = await inviteUser({ ...admin, roles: ["admin"], departmentId: null } as never, {
      email,
      name: "Noor Halden",
      roles: ["instructor"],
      departmentId: null,
    });
    const [row] = await getDb()
      .select()
      .from(mailOutbox)
      .where(and(eq(mailOutbox.toAddress, email), eq(mailOutbox.kind, "invitation")))
      .orderBy(desc(mailOutbox.id));
    const stored = JSON.stringify(row.data);
    expect(stored).not.toContain(token);
    expect(row.data).toMatchObject({ invitationId: invitation.id });
    // The database keeps only the token's hash; the link is rebuilt from the id with the key.
    expect(invitationToken(invitation.id)).toBe(token);
    const [hashRow] = await getDb()
      .execute<{ n: number }>(sql`SELECT count(*)::int AS n FROM invitation WHERE token_hash = ${hashToken(token)}`)
      .then((r) => r.rows);
    expect(hashRow.n).toBe(1);
    // Rendering (the first send, and any retry) puts the working link in the message.
    const first = await composeOutboxMail(row);
    const again = await composeOutboxMail(row);
    expect(first.raw.toString("utf8").replace(/=\r\n/g, "")).toContain(token);
    expect(again.raw.toString("utf8").replace(/=\r\n/g, "")).toContain(token);
    // Sent through the local inbox, and still nothing secret in the row afterwards.
    await deliverDueMail({ ids: [row.id] });
    const [after] = await getDb().select().from(mailOutbox).where(eq(mailOutbox.id, row.id));
    expect(after.status).toBe("sent");
    expect(JSON.stringify(after.data)).not.toContain(token);
    // The link works.
    expect((await http(`/invite/${token}`)).status).toBe(200);
  });

  it("drops a ready-made link from an invitation row once the relay has accepted it", async () => {
    const to = `${uniq("legacy")}@example.test`;
    const url = `http://127.0.0.1/invite/${"k".repeat(43)}`;
    await getDb()
      .insert(mailOutbox)
      .values({
        kind: "invitation",
        toAddress: to,
        subject: "You are invited to Benchclear",
        data: { name: "A", invitedBy: "B", url, expiresAt: new Date().toISOString() },
      });
    const [row] = await getDb().select().from(mailOutbox).where(eq(mailOutbox.toAddress, to));
    await deliverDueMail({ ids: [row.id] });
    const [after] = await getDb().select().from(mailOutbox).where(eq(mailOutbox.id, row.id));
    expect(after.status).toBe("sent");
    expect(after.data).not.toHaveProperty("url");
  });
});
