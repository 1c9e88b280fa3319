// POST /api/review/[id]/training-exception — the final approver records a signed exception for the
// named operators whose required course is lapsed or missing through the permit's last day (reason,
// password). 403 for anyone but the person who may approve now, 409 when there is nothing to except.
import { clientIp } from "@/lib/http/client-ip";
import { route } from "@/lib/http/route";
import { recordTrainingException } from "@/lib/review/training-exception";
import { trainingExceptionSchema } from "@/lib/training/schemas";

export const POST = route(
  { access: "permit.approve", body: trainingExceptionSchema, ids: { id: "That application" } },
  async ({ request, user, body, params }) => {
    const row = await recordTrainingException(user, params.id, body, { ip: clientIp(request.headers) });
    return Response.json(
      {
        exception: {
          id: row.id,
          throughDay: row.throughDay,
          gaps: row.gaps,
          reason: row.reason,
          signerName: row.signerName,
          signerRole: row.signerRole,
          meaning: row.meaning,
          signedAt: row.signedAt,
        },
      },
      { status: 201 },
    );
  },
);
