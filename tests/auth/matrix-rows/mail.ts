import crypto from "node:crypto";
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { users } from "@/db/schema";
import { hashCalendarToken } from "@/lib/calendar/queries";
import { adminOnly, everyone, signedIn, type MatrixRow } from "../matrix-kit";

// Mail and calendars: the caught-mail page and its API (admins, inbox only), the calendar feed
// (public: the secret token is the credential) and the signed-in user's own feed token.
export const MAIL_ROWS: MatrixRow[] = [
  { route: "/dev/mail", method: "PAGE", expect: adminOnly(200, "→/sign-in", "→/forbidden") },
  { route: "/api/dev/mail", method: "GET", expect: adminOnly(200, 401, 403) },
  {
    route: "/api/dev/mail/[id]",
    method: "GET",
    path: () => "/api/dev/mail/1700000000000-0badc0de",
    expect: adminOnly(404, 401, 403),
  },
  {
    route: "/api/calendar/[token]",
    method: "GET",
    // A live feed token of another user: anyone holding the address reads it, whoever they are.
    prepare: async (c) => {
      const token = crypto.randomBytes(32).toString("base64url");
      await getDb()
        .update(users)
        .set({ calendarToken: hashCalendarToken(token) })
        .where(eq(users.id, c.targetUserId));
      return { token };
    },
    path: (c) => `/api/calendar/${c.data.token}`,
    expect: everyone(200),
  },
  { route: "/api/me/calendar-token", method: "GET", expect: signedIn(200, 401) },
  { route: "/api/me/calendar-token", method: "POST", body: () => ({}), expect: signedIn(201, 401) },
  { route: "/api/me/calendar-token", method: "DELETE", body: () => ({}), expect: signedIn(200, 401) },
];
