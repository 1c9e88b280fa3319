// GET /api/review — the review queue as JSON: waiting applications this user may sign (or, with
// scope=all, every waiting application they may see), oldest wait first, one page at a time.
import { route } from "@/lib/http/route";
import { listQueue } from "@/lib/review/queries";
import { queueQuerySchema } from "@/lib/review/schemas";

export const GET = route({ access: "application.review", query: queueQuerySchema }, async ({ user, query }) => {
  const { rows, total, more, hasNext, page, pageSize } = await listQueue(user, {
    tier: query.tier,
    departmentId: query.department,
    state: query.state,
    minAgeDays: query.age,
    scope: query.scope,
    page: query.page,
  });
  // total stops at QUEUE_COUNT_CAP (lib/review/counts); totalIsAtLeast says there are more.
  return { applications: rows, total, totalIsAtLeast: more, hasNext, page, pageSize };
});
