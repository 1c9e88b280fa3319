// GET /api/training/records — your own training record, or (?userId=, for safety officers and
// admins) anyone's, with each course's status today.
// POST … — a safety officer or admin records a course a person completed (course, day, trainer); the
// certificate is uploaded after, to /api/training/records/[id]/certificate.
import { route } from "@/lib/http/route";
import { institutionToday } from "@/lib/permits/queries";
import { recordTraining } from "@/lib/training/actions";
import { recordsOf } from "@/lib/training/queries";
import { recordsQuerySchema, trainingRecordSchema } from "@/lib/training/schemas";

export const GET = route({ access: "user", query: recordsQuerySchema }, async ({ user, query }) => ({
  records: await recordsOf(user, query.userId ?? user.id, await institutionToday()),
}));

export const POST = route({ access: "training.record", body: trainingRecordSchema }, async ({ user, body }) => {
  const record = await recordTraining(user, body);
  return Response.json({ record }, { status: 201 });
});
