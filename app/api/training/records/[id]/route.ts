// DELETE /api/training/records/[id] — a safety officer or admin withdraws a record entered in error
// (kept for the record and the audit trail, no longer counted).
import { route } from "@/lib/http/route";
import { removeTrainingRecord } from "@/lib/training/actions";

export const DELETE = route(
  { ids: { id: "That training record" }, access: "training.record" },
  async ({ user, params }) => ({ record: await removeTrainingRecord(user, params.id) }),
);
