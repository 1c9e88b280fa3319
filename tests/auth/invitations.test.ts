import { and, desc, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { invitationToken, invitationUrl } from "@/lib/users/invitation-token";
import { auditEvents, mailOutbox, users } from "@/db/schema";
import { inviteUser } from "@/lib/users/actions";
import { createDepartment, createUser, requireDatabase, uniq } from "../support/db";
import { http, signIn } from "../support/http";

requireDatabase();

async function linkFor(email: string): Promise<string> {
  const [mail] = await getDb()
    .select()
    .from(mailOutbox)
    .where(and(eq(mailOutbox.toAddress, email), eq(mailOutbox.kind, "invitation")))
    .orderBy(desc(mailOutbox.id))
    .limit(1);
  expect(mail, `an invitation mail to ${email} is queued`).toBeDefined();
  // The row keeps the invitation's id, not the link; the link is rebuilt from it as the mail is.
  expect(mail.data).not.toHaveProperty("url");
  return invitationUrl(invitationToken(String(mail.data.invitationId)));
}

describe("invitations", () => {
  it("an admin invites; the link works once and signs the new person in", async () => {
    const admin = await createUser({ roles: ["admin"] });
    const dept = await createDepartment();
    const cookie = await signIn(admin.email);
    const email = `${uniq("new")}@example.test`;

    const created = await http("/api/admin/invitations", {
      method: "POST",
      cookie,
      body: { email, name: "Noor Halden", roles: ["instructor", "reviewer"], departmentId: dept.id },
    });
    expect(created.status).toBe(201);
    expect(created.text).not.toMatch(/token|\/invite\//);

    const url = new URL(await linkFor(email));
    const token = url.pathname.split("/").pop()!;
    expect(token.length).toBeGreaterThanOrEqual(43); // 32 random bytes, base64url

    const page = await http(url.pathname);
    expect(page.status).toBe(200);
    expect(page.text).toContain("Noor Halden");

    const weak = await http("/api/invitations/accept", { method: "POST", body: { token, password: "password1234" } });
    expect(weak.status).toBe(422);
    expect(weak.json?.error.issues[0].path).toBe("password");

    const short = await http("/api/invitations/accept", { method: "POST", body: { token, password: "short" } });
    expect(short.status).toBe(422);

    const accepted = await http("/api/invitations/accept", {
      method: "POST",
      body: { token, password: "a kettle of teal sparks" },
    });
    expect(accepted.status).toBe(201);
    expect(accepted.headers.getSetCookie().some((c) => c.startsWith("authjs.session-token="))).toBe(true);

    const [user] = await getDb().select().from(users).where(eq(users.email, email));
    expect(user.roles).toEqual(["instructor", "reviewer"]);
    expect(user.departmentId).toBe(dept.id);
    expect(user.passwordHash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);

    const again = await http("/api/invitations/accept", {
      method: "POST",
      body: { token, password: "another kettle of sparks" },
    });
    expect(again.status).toBe(404);
    expect((await http(url.pathname)).text).toContain("not valid any more");

    const audit = await getDb().select().from(auditEvents).where(eq(auditEvents.entityId, user.id));
    expect(audit.map((a) => a.action)).toContain("user.invitation_accepted");
  });

  it("an expired link is refused", async () => {
    const admin = await createUser({ roles: ["admin"] });
    const email = `${uniq("late")}@example.test`;
    const eightDaysAgo = new Date(Date.now() - 8 * 24 * 3600 * 1000);
    const { token } = await inviteUser(
      { id: admin.id, email: admin.email, name: admin.name, roles: admin.roles, departmentId: null },
      { email, name: "Late Comer", roles: ["instructor"], departmentId: null },
      eightDaysAgo,
    );
    const res = await http("/api/invitations/accept", {
      method: "POST",
      body: { token, password: "a kettle of teal sparks" },
    });
    expect(res.status).toBe(404);
    expect(await getDb().select().from(users).where(eq(users.email, email))).toHaveLength(0);
  });

  it("a newer invitation replaces the older link", async () => {
    const admin = await createUser({ roles: ["admin"] });
    const actor = { id: admin.id, email: admin.email, name: admin.name, roles: admin.roles, departmentId: null };
    const email = `${uniq("twice")}@example.test`;
    const first = await inviteUser(actor, { email, name: "Twice Asked", roles: ["instructor"], departmentId: null });
    await inviteUser(actor, { email, name: "Twice Asked", roles: ["instructor"], departmentId: null });
    const res = await http("/api/invitations/accept", {
      method: "POST",
      body: { token: first.token, password: "a kettle of teal sparks" },
    });
    expect(res.status).toBe(404);
  });

  it("only admins may invite, and nobody can invite an existing e-mail", async () => {
    const instructor = await createUser({ roles: ["instructor"] });
    const cookie = await signIn(instructor.email);
    const res = await http("/api/admin/invitations", {
      method: "POST",
      cookie,
      body: { email: "someone@example.test", name: "Some One", roles: ["admin"], departmentId: null },
    });
    expect(res.status).toBe(403);

    const admin = await createUser({ roles: ["admin"] });
    const adminCookie = await signIn(admin.email);
    const dup = await http("/api/admin/invitations", {
      method: "POST",
      cookie: adminCookie,
      body: { email: instructor.email, name: "Dup", roles: ["instructor"], departmentId: null },
    });
    expect(dup.status).toBe(409);
  });
});

describe("admin user changes", () => {
  it("disable, re-enable and role changes are audited; an admin cannot lock themselves out", async () => {
    const admin = await createUser({ roles: ["admin"] });
    const target = await createUser({ roles: ["instructor"] });
    const cookie = await signIn(admin.email);

    const disabled = await http(`/api/admin/users/${target.id}`, { method: "PATCH", cookie, body: { disabled: true } });
    expect(disabled.status).toBe(200);
    expect(disabled.json?.user.disabledAt).not.toBeNull();
    const enabled = await http(`/api/admin/users/${target.id}`, { method: "PATCH", cookie, body: { disabled: false } });
    expect(enabled.json?.user.disabledAt).toBeNull();
    const roles = await http(`/api/admin/users/${target.id}`, {
      method: "PATCH",
      cookie,
      body: { roles: ["reviewer"] },
    });
    expect(roles.json?.user.roles).toEqual(["reviewer"]);

    const actions = (await getDb().select().from(auditEvents).where(eq(auditEvents.entityId, target.id))).map(
      (a) => a.action,
    );
    expect(actions).toEqual(expect.arrayContaining(["user.disabled", "user.enabled", "user.updated"]));

    const self = await http(`/api/admin/users/${admin.id}`, { method: "PATCH", cookie, body: { disabled: true } });
    expect(self.status).toBe(409);
    const bad = await http(`/api/admin/users/not-a-uuid`, { method: "PATCH", cookie, body: { disabled: true } });
    // An id that is not one names no user: the same 404 as a user that does not exist (route()'s ids).
    expect(bad.status).toBe(404);
    expect(bad.json?.error.code).toBe("not_found");
    const empty = await http(`/api/admin/users/${target.id}`, { method: "PATCH", cookie, body: {} });
    expect(empty.status).toBe(422);
  });

  it("a user changes their own password; the old one stops working", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const cookie = await signIn(user.email);
    const wrong = await http("/api/me/password", {
      method: "POST",
      cookie,
      body: { currentPassword: "not mine at all", newPassword: "a brand new teal kettle" },
    });
    expect(wrong.status).toBe(422);
    expect(wrong.json?.error.issues[0].path).toBe("currentPassword");
    const ok = await http("/api/me/password", {
      method: "POST",
      cookie,
      body: { currentPassword: "correct horse battery staple 42", newPassword: "a brand new teal kettle" },
    });
    expect(ok.status).toBe(200);
    await expect(signIn(user.email)).rejects.toThrow(/401/);
    await expect(signIn(user.email, "a brand new teal kettle")).resolves.toContain("authjs.session-token");
  });
});
