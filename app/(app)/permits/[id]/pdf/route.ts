// GET /permits/[id]/pdf — the permit as a printable PDF (A4, or US Letter with ?size=letter) for the
// people who may see the permit; the file name is the permit number.
import { route } from "@/lib/http/route";
import { documentQuerySchema, permitDocumentResponse, signInRedirect } from "@/lib/pdf/http";

export const GET = route({ access: "public", query: documentQuerySchema }, async ({ request, user, params, query }) => {
  if (!user) return signInRedirect(request);
  return permitDocumentResponse({ user, permitId: params.id, kind: "permit", size: query.size });
});
