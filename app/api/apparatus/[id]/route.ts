// GET /api/apparatus/[id] — one apparatus the user may read: current revision (set-up, assessment)
// and its revision list. PATCH /api/apparatus/[id] — saves an edit as the next revision (409 when
// someone saved another revision since `expectedRevision`); active permits over the apparatus are
// flagged for re-review in the same transaction (lib/rereview).
import { getApparatus } from "@/lib/apparatus/queries";
import { readableAssessment, type Assessment } from "@/lib/hazard";
import { route } from "@/lib/http/route";
import { apparatusUpdateSchema } from "@/lib/apparatus/schemas";
import { reviseApparatus } from "@/lib/rereview/actions";

export const GET = route({ ids: { id: "That apparatus" }, access: "apparatus.read" }, async ({ user, params }) => {
  const found = await getApparatus(user, params.id);
  // A revision assessed by engine 1 named an internal working file in its sources; the answer drops
  // those pointers (the stored snapshot stays as it was signed).
  const current = found.current && {
    ...found.current,
    assessment: readableAssessment(found.current.assessment as Assessment),
  };
  return { apparatus: { ...found, current } };
});

export const PATCH = route(
  { ids: { id: "That apparatus" }, access: "apparatus.write", body: apparatusUpdateSchema },
  async ({ user, body, params }) => ({
    apparatus: await reviseApparatus(user, params.id, body),
  }),
);
