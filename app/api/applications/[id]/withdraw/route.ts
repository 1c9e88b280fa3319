// POST /api/applications/[id]/withdraw — the applicant withdraws a draft or an application under
// review (409 once decided, or when the version moved on).
import { withdrawApplication } from "@/lib/applications/actions";
import { route } from "@/lib/http/route";
import { versionedActionSchema } from "@/lib/applications/schemas";

export const POST = route(
  { ids: { id: "That application" }, access: "application.withdraw", body: versionedActionSchema },
  async ({ user, body, params }) => ({
    application: await withdrawApplication(user, params.id, body.expectedVersion),
  }),
);
