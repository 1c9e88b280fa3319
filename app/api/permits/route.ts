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
  const { rows, total, page, pageSize } = await listPermits(user, query);
  return { permits: rows, total, page, pageSize };
});
