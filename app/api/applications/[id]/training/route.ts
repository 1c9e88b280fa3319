// GET /api/applications/[id]/training — the applicant's own draft, as last saved: each named
// operator's training against the courses its tier requires, through the permit's proposed last day
// (issue 17: shown beside each person on the form's last step, before they submit). Decides nothing.
import { route } from "@/lib/http/route";
import { submissionTrainingCheck } from "@/lib/review/training";

export const GET = route(
  { ids: { id: "That application" }, access: "application.create" },
  async ({ user, params }) => ({
    training: await submissionTrainingCheck(user, params.id),
  }),
);
