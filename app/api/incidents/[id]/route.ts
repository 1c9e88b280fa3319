// GET /api/incidents/[id] — one report, for its reporter, officers and admins, and the holder of the
// permit it names (without the reporter's name).
// PATCH /api/incidents/[id] — a safety officer's step: open → investigating → closed, with findings
// and actions; the reporter and the officers are told by e-mail.
import { route } from "@/lib/http/route";
import { triageIncident } from "@/lib/incidents/actions";
import { getIncident } from "@/lib/incidents/queries";
import { incidentTriageSchema } from "@/lib/incidents/schemas";

export const GET = route({ access: "incident.report", ids: { id: "That report" } }, async ({ user, params }) =>
  getIncident(user, params.id),
);

export const PATCH = route(
  { access: "incident.triage", ids: { id: "That report" }, body: incidentTriageSchema },
  async ({ user, params, body }) => {
    const { incident, step, mailed } = await triageIncident(user, params.id, body);
    return { incident: { id: incident.id, state: incident.state, version: incident.version }, step, mailed };
  },
);
