// GET /api/permits — the permits this user may see (their own, their department's for reviewers,
// all for safety officers), with the effective state, one page at a time.
import { z } from "zod";
import { route } from "@/lib/http/route";
import { listPermits } from "@/lib/permits/queries";

const blank = (v: unknown) => (v === "" ? undefined : v);
const querySchema = z.object({
  state: z.preprocess(blank, z.enum(["active", "expired", "revoked"]).optional()),
  tier: z.preprocess(blank, z.coerce.number().int().min(0).max(4).optional()),
  page: z.preprocess(blank, z.coerce.number().int().min(1).max(100_000).default(1)),
});

export const GET = route({ access: "user", query: querySchema }, async ({ user, query }) => {
  const { rows, total, more, hasNext, page, pageSize } = await listPermits(user, query);
  // total stops at PERMIT_COUNT_CAP (lib/permits/queries.ts); totalIsAtLeast says there are more.
  return { permits: rows, total, totalIsAtLeast: more, hasNext, page, pageSize };
});
