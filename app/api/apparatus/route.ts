// GET /api/apparatus — the registry records this user may read, paged, sorted and filtered on the
// server (query string validated: page, pageSize, sort, dir, q, tier, owner).
// POST /api/apparatus — registers apparatus: revision 1 with its assessment under the rules in force.
import { createApparatus } from "@/lib/apparatus/actions";
import { listApparatus } from "@/lib/apparatus/queries";
import { route } from "@/lib/http/route";
import { apparatusCreateSchema, apparatusListQuerySchema } from "@/lib/apparatus/schemas";

export const GET = route({ access: "apparatus.read", query: apparatusListQuerySchema }, async ({ user, query }) =>
  listApparatus(user, query),
);

export const POST = route({ access: "apparatus.write", body: apparatusCreateSchema }, async ({ user, body }) =>
  Response.json({ apparatus: await createApparatus(user, body) }, { status: 201 }),
);
