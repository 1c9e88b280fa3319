// POST /api/permits/[id]/revoke — a safety officer revokes an active permit, with a reason and their
// password; the holder and the people named on it are told by e-mail.
import { clientIp } from "@/lib/http/client-ip";
import { route } from "@/lib/http/route";
import { revokePermit } from "@/lib/permits/revoke";
import { revokeBodySchema } from "@/lib/permits/schemas";

export const POST = route(
  { access: "permit.revoke", body: revokeBodySchema, ids: { id: "That permit" } },
  async ({ request, user, body, params }) => {
    const { permit, decision } = await revokePermit(user, params.id, body, { ip: clientIp(request.headers) });
    return {
      permit: {
        id: permit.id,
        number: permit.number,
        state: permit.state,
        version: permit.version,
        revokedAt: permit.revokedAt,
      },
      decision: {
        id: decision.id,
        kind: decision.kind,
        signerName: decision.signerName,
        meaning: decision.meaning,
        signedAt: decision.signedAt,
      },
    };
  },
);
