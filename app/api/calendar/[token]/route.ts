// GET /api/calendar/[token] — a person's permit calendar (iCalendar, RFC 5545) for calendar apps to
// subscribe to. The secret token in the URL is the credential (no session: calendar apps have none);
// an unknown or removed token, or a disabled account's, answers 404. "/api/calendar/<token>.ics"
// works too, for apps that want the extension.
import { calendarFeed } from "@/lib/calendar/queries";
import { notFound } from "@/lib/errors";
import { route } from "@/lib/http/route";

export const GET = route({ access: "public" }, async ({ params }) => {
  const token = (params.token ?? "").replace(/\.ics$/, "");
  const ics = await calendarFeed(token);
  if (ics === null) throw notFound("The calendar at this address");
  return new Response(ics, {
    headers: {
      "Content-Type": "text/calendar; charset=utf-8",
      "Content-Disposition": 'inline; filename="benchclear-permits.ics"',
      "Cache-Control": "private, no-store",
      // The token must not leak through links followed from a calendar app's web view.
      "Referrer-Policy": "no-referrer",
      "X-Robots-Tag": "noindex, nofollow",
    },
  });
});
