// GET /permits/[id]/bench-card — the one-page bench card (discharge procedure, emergency contacts,
// QR code, permit number and state) for lamination beside the apparatus; A4 or ?size=letter.
import { route } from "@/lib/http/route";
import { documentQuerySchema, permitDocumentResponse, signInRedirect } from "@/lib/pdf/http";

export const GET = route({ access: "public", query: documentQuerySchema }, async ({ request, user, params, query }) => {
  if (!user) return signInRedirect(request);
  return permitDocumentResponse({ user, permitId: params.id, kind: "bench-card", size: query.size });
});
