// GET /permits/[id]/assessment — the full assessment for the file (every figure, reason, source and
// control) as a PDF, A4 or ?size=letter, for the people who may see the permit; rendered from the same
// print snapshot as the permit.
import { route } from "@/lib/http/route";
import { documentQuerySchema, permitDocumentResponse, signInRedirect } from "@/lib/pdf/http";

export const GET = route({ access: "public", query: documentQuerySchema }, async ({ request, user, params, query }) => {
  if (!user) return signInRedirect(request);
  return permitDocumentResponse({ user, permitId: params.id, kind: "assessment", size: query.size });
});
