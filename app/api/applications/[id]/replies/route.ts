// POST /api/applications/[id]/replies — the applicant answers a return comment (201). Stored beside
// the signed decision and audited; reviewers see it on the application page.
import { idParam } from "@/lib/applications/params";
import { route } from "@/lib/http/route";
import { replyBodySchema, replyToComment } from "@/lib/review/replies";

export const POST = route({ access: "application.create", body: replyBodySchema }, async ({ user, body, params }) => {
  const reply = await replyToComment(user, idParam(params.id, "That application"), body);
  return Response.json({ reply }, { status: 201 });
});
