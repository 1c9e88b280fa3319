// POST /api/applications/[id]/replies — the applicant answers a return comment (201). Stored beside
// the signed decision and audited; reviewers see it on the application page.
import { route } from "@/lib/http/route";
import { replyBodySchema, replyToComment } from "@/lib/review/replies";

export const POST = route(
  { ids: { id: "That application" }, access: "application.create", body: replyBodySchema },
  async ({ user, body, params }) => {
    const reply = await replyToComment(user, params.id, body);
    return Response.json({ reply }, { status: 201 });
  },
);
