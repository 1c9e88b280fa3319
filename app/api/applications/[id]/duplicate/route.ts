// POST /api/applications/[id]/duplicate — a new draft from one of the applicant's applications: the
// same event and set-up, dates cleared, controls and attestation to confirm again.
import { z } from "zod";
import { duplicateApplication } from "@/lib/applications/actions";
import { route } from "@/lib/http/route";

export const POST = route(
  { ids: { id: "That application" }, access: "application.create", body: z.strictObject({}) },
  async ({ user, params }) =>
    Response.json({ application: await duplicateApplication(user, params.id) }, { status: 201 }),
);
