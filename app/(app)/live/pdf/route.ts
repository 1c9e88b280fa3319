// GET /live/pdf — the live sheet (where high voltage is live today) as one A4 landscape page, for the
// safety office and emergency responders ("live.read"). A link opened in the browser: a visitor
// without a session is sent to sign in, an account without the permission to the 403 page.
import { can } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { forbiddenRedirect, signInRedirect } from "@/lib/pdf/http";
import { renderLiveSheet } from "@/lib/pdf/live-sheet";
import { liveSheet } from "@/lib/permits/live";

export const GET = route({ access: "public" }, async ({ request, user }) => {
  if (!user) return signInRedirect(request);
  if (!can(user, "live.read")) return forbiddenRedirect();
  const sheet = await liveSheet(user);
  const pdf = await renderLiveSheet(sheet);
  return new Response(new Uint8Array(pdf), {
    status: 200,
    headers: {
      "Content-Type": "application/pdf",
      "Content-Length": String(pdf.length),
      "Content-Disposition": `attachment; filename="live-high-voltage-${sheet.today}.pdf"`,
      "X-Content-Type-Options": "nosniff",
      // Today's list, for this signed-in account: never cached.
      "Cache-Control": "private, no-store",
    },
  });
});
