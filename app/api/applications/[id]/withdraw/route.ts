// POST /api/applications/[id]/withdraw — the applicant withdraws a draft or an application under
// review (409 once decided, or when the version moved on).
import { withdrawApplication } from "@/lib/applications/actions";
import { idParam } from "@/lib/applications/params";
import { route } from "@/lib/http/route";
import { versionedActionSchema } from "@/lib/applications/schemas";

export const POST = route(
  { access: "application.withdraw", body: versionedActionSchema },
  async ({ user, body, params }) => ({
    application: await withdrawApplication(user, idParam(params.id, "That application"), body.expectedVersion),
  }),
);
