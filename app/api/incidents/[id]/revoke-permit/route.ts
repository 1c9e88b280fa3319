// POST /api/incidents/[id]/revoke-permit — a safety officer revokes the permit a report names, from
// the report: the permit's revoke rules (password, separation of duties, an active permit at the
// version seen), and the report's step, in one transaction.
import { clientIp } from "@/lib/http/client-ip";
import { route } from "@/lib/http/route";
import { revokePermitFromIncident } from "@/lib/incidents/actions";
import { incidentRevokeSchema } from "@/lib/incidents/schemas";

export const POST = route(
  { access: "permit.revoke", ids: { id: "That report" }, body: incidentRevokeSchema },
  async ({ request, user, params, body }) => {
    const { incident, permit, decision } = await revokePermitFromIncident(user, params.id, body, {
      ip: clientIp(request.headers),
    });
    return {
      incident: { id: incident.id, version: incident.version, permitRevokedAt: incident.permitRevokedAt },
      permit: { id: permit.id, number: permit.number, state: permit.state, version: permit.version },
      decision: { id: decision.id, kind: decision.kind, signedAt: decision.signedAt },
    };
  },
);
