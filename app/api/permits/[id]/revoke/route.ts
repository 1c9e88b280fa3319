// POST /api/permits/[id]/revoke — a safety officer revokes an active permit, with a reason and their
// password; the holder and the people named on it are told by e-mail.
import { z } from "zod";
import { clientIp } from "@/lib/http/client-ip";
import { fromZodError } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { revokePermit } from "@/lib/permits/revoke";
import { revokeBodySchema } from "@/lib/permits/schemas";

const idSchema = z.uuid({ error: "must be a permit id" });

export const POST = route(
  { access: "permit.revoke", body: revokeBodySchema },
  async ({ request, user, body, params }) => {
    const id = idSchema.safeParse(params.id);
    if (!id.success) throw fromZodError(id.error, "id");
    const { permit, decision } = await revokePermit(user, id.data, body, { ip: clientIp(request.headers) });
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
