// GET /api/applications — the signed-in applicant's own applications, paged and sorted on the server.
// POST /api/applications — starts a draft (empty, prefilled, or from a registry apparatus).
import { createDraft } from "@/lib/applications/actions";
import { listMyApplications } from "@/lib/applications/queries";
import { route } from "@/lib/http/route";
import { applicationListQuerySchema, draftCreateSchema } from "@/lib/applications/schemas";

export const GET = route({ access: "user", query: applicationListQuerySchema }, async ({ user, query }) =>
  listMyApplications(user, query),
);

export const POST = route({ access: "application.create", body: draftCreateSchema }, async ({ user, body }) =>
  Response.json({ application: await createDraft(user, body) }, { status: 201 }),
);
