// GET /api/me/calendar-token — whether the signed-in user has a calendar feed.
// POST /api/me/calendar-token — creates the feed address, or replaces it (the old one stops working);
// the answer carries the address, shown this once.
// DELETE /api/me/calendar-token — removes the feed address.
import { z } from "zod";
import { removeCalendarToken, rotateCalendarToken } from "@/lib/calendar/actions";
import { hasCalendarFeed } from "@/lib/calendar/queries";
import { route } from "@/lib/http/route";

// No fields: the body is an empty JSON object, so the JSON content-type check still applies.
const emptyBody = z.strictObject({}).optional();

export const GET = route({ access: "user" }, async ({ user }) => ({ exists: await hasCalendarFeed(user.id) }));

export const POST = route({ access: "user", body: emptyBody }, async ({ user }) => {
  const { url } = await rotateCalendarToken(user);
  return Response.json({ url }, { status: 201, headers: { "Cache-Control": "no-store" } });
});

export const DELETE = route({ access: "user", body: emptyBody }, async ({ user }) => removeCalendarToken(user));
