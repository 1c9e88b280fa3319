// GET /api/incidents — the incident and near-miss reports this user may read, newest first
// (query: state, permitId, apparatusId, page).
// POST /api/incidents — anyone signed in reports an incident or a near miss; the reporter and the
// safety officers are told by e-mail.
import { route } from "@/lib/http/route";
import { reportIncident } from "@/lib/incidents/actions";
import { listIncidents } from "@/lib/incidents/queries";
import { incidentListQuerySchema, incidentReportSchema } from "@/lib/incidents/schemas";

export const GET = route({ access: "incident.report", query: incidentListQuerySchema }, async ({ user, query }) =>
  listIncidents(user, query),
);

export const POST = route({ access: "incident.report", body: incidentReportSchema }, async ({ user, body }) => {
  const row = await reportIncident(user, body);
  return Response.json(
    {
      incident: {
        id: row.id,
        seq: row.seq,
        state: row.state,
        version: row.version,
        permitId: row.permitId,
        apparatusId: row.apparatusId,
      },
    },
    { status: 201 },
  );
});
