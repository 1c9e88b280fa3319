// POST /api/applications/[id]/submit — freezes the saved draft into a new revision (content rebuilt
// and validated on the server, assessment recomputed) and sends it for review. 422 names each field
// still missing; 409 when the version moved on.
import { submitApplication } from "@/lib/applications/actions";
import { route } from "@/lib/http/route";
import { versionedActionSchema } from "@/lib/applications/schemas";

export const POST = route(
  { ids: { id: "That application" }, access: "application.submit", body: versionedActionSchema },
  async ({ user, body, params }) => ({
    application: await submitApplication(user, params.id, body.expectedVersion),
  }),
);
