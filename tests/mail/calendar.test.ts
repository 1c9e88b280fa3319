// The per-user calendar feed over HTTP against the production build: the signed-in user creates a
// secret feed address, calendar apps read it without a session, replacing or removing it stops the
// old address at once, and a disabled account's feed is gone.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { users } from "@/db/schema";
import { requireDatabase } from "../support/db";
import { http, signIn } from "../support/http";
import { createPermitFixture } from "../jobs/support";

requireDatabase();

describe("/api/me/calendar-token and /api/calendar/[token]", () => {
  it("creates a feed listing the holder's permits, readable without a session; replacing it retires the old address", async () => {
    const f = await createPermitFixture({ validFrom: "2098-02-01", validTo: "2098-04-30" });
    const cookie = await signIn(f.holder.email);
    expect((await http("/api/me/calendar-token", { cookie })).json).toEqual({ exists: false });

    const created = await http("/api/me/calendar-token", { method: "POST", cookie, body: {} });
    expect(created.status).toBe(201);
    const url = new URL(created.json!.url);
    expect(url.pathname).toMatch(/^\/api\/calendar\/[A-Za-z0-9_-]{43}$/);
    expect((await http("/api/me/calendar-token", { cookie })).json).toEqual({ exists: true });
    // Only the hash is stored.
    const [row] = await getDb().select({ token: users.calendarToken }).from(users).where(eq(users.id, f.holder.id));
    expect(row.token).toMatch(/^[0-9a-f]{64}$/);
    expect(url.pathname).not.toContain(row.token!);

    const feed = await http(url.pathname);
    expect(feed.status).toBe(200);
    expect(feed.headers.get("content-type")).toBe("text/calendar; charset=utf-8");
    expect(feed.headers.get("cache-control")).toContain("no-store");
    const unfolded = feed.text.replace(/\r\n /g, "");
    expect(unfolded).toContain(`SUMMARY:Permit ${f.permit.number} valid: `);
    expect(unfolded).toContain("DTSTART;VALUE=DATE:20980201\r\nDTEND;VALUE=DATE:20980501");
    expect(unfolded).toContain(`UID:permit-${f.permit.id}-last-day@`);
    expect((await http(`${url.pathname}.ics`)).status).toBe(200);

    // The operator named on the application sees it in their own feed too.
    const operatorCookie = await signIn(f.operator.email);
    const operatorFeed = await http("/api/me/calendar-token", { method: "POST", cookie: operatorCookie, body: {} });
    expect((await http(new URL(operatorFeed.json!.url).pathname)).text).toContain(f.permit.number);

    const replaced = await http("/api/me/calendar-token", { method: "POST", cookie, body: {} });
    expect(replaced.status).toBe(201);
    expect((await http(url.pathname)).status).toBe(404);
    expect((await http(new URL(replaced.json!.url).pathname)).status).toBe(200);

    const removed = await http("/api/me/calendar-token", { method: "DELETE", cookie, body: {} });
    expect(removed.json).toEqual({ removed: true });
    expect((await http(new URL(replaced.json!.url).pathname)).status).toBe(404);
  });

  it("answers 404 for a disabled account's feed and for malformed tokens", async () => {
    const f = await createPermitFixture({ validFrom: "2098-02-01", validTo: "2098-04-30" });
    const cookie = await signIn(f.holder.email);
    const created = await http("/api/me/calendar-token", { method: "POST", cookie, body: {} });
    const path = new URL(created.json!.url).pathname;
    await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, f.holder.id));
    expect((await http(path)).status).toBe(404);
    for (const bad of ["x", "%0d%0a", "a".repeat(200)]) expect((await http(`/api/calendar/${bad}`)).status).toBe(404);
  });

  it("refuses a cross-site or non-JSON request to create a feed", async () => {
    const f = await createPermitFixture({ validFrom: "2098-02-01", validTo: "2098-04-30" });
    const cookie = await signIn(f.holder.email);
    expect(
      (
        await http("/api/me/calendar-token", {
          method: "POST",
          cookie,
          body: {},
          headers: { origin: "https://evil.example" },
        })
      ).status,
    ).toBe(403);
    expect(
      (
        await http("/api/me/calendar-token", {
          method: "POST",
          cookie,
          rawBody: "x",
          headers: { "content-type": "text/plain" },
        })
      ).status,
    ).toBe(415);
    expect((await http("/api/me/calendar-token", { method: "POST", cookie, body: { token: "mine" } })).status).toBe(
      422,
    );
  });
});
