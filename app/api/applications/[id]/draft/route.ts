// GET /api/applications/[id]/draft — the applicant's draft, saved step, version and attachments.
// PATCH /api/applications/[id]/draft — autosave: the whole draft and step, guarded by
// `expectedVersion` (409 when it was saved elsewhere or is no longer a draft).
import { saveDraft } from "@/lib/applications/actions";
import { getDraftForEdit } from "@/lib/applications/queries";
import { route } from "@/lib/http/route";
import { draftSaveSchema } from "@/lib/applications/schemas";

export const GET = route({ ids: { id: "That application" }, access: "user" }, async ({ user, params }) => ({
  application: await getDraftForEdit(user, params.id),
}));

export const PATCH = route(
  { ids: { id: "That application" }, access: "application.create", body: draftSaveSchema, maxBodyBytes: 512 * 1024 },
  async ({ user, body, params }) => ({
    application: await saveDraft(user, params.id, body),
  }),
);
