// POST /api/review/[id]/decisions — sign a decision on the application's current revision:
// recommend, return (comment), approve (password, requirements confirmed, validity window) or
// reject (password, comment). 403 for the wrong person, 409 when it is no longer waiting for it.
import { clientIp } from "@/lib/http/client-ip";
import { route } from "@/lib/http/route";
import { decide } from "@/lib/review/decide";
import { decisionBodySchema } from "@/lib/review/schemas";

export const POST = route(
  { access: "application.review", body: decisionBodySchema, ids: { id: "That application" } },
  async ({ request, user, body, params }) => {
    const result = await decide(user, params.id, body, { ip: clientIp(request.headers) });
    return Response.json(
      {
        application: {
          id: result.application.id,
          state: result.application.state,
          version: result.application.version,
        },
        decision: {
          id: result.decision.id,
          kind: result.decision.kind,
          step: result.decision.step,
          signerName: result.decision.signerName,
          signerRole: result.decision.signerRole,
          meaning: result.decision.meaning,
          contentHash: result.decision.contentHash,
          signedAt: result.decision.signedAt,
        },
        permit: result.permit
          ? {
              id: result.permit.id,
              number: result.permit.number,
              validFrom: result.permit.validFrom,
              validTo: result.permit.validTo,
            }
          : null,
      },
      { status: 201 },
    );
  },
);
