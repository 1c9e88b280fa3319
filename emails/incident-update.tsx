import type { IncidentStep } from "@/lib/outbox";
import { appLink, formatInstant, type EmailBuilder } from "./context";

// To the reporter and the safety officers: an incident or near-miss report moved a step.

const WHAT: Record<IncidentStep, (ref: string, actor: string) => string> = {
  reported: (ref, actor) => `${actor} reported ${ref}. A safety officer will look at it and move it on.`,
  investigating: (ref, actor) => `${actor} is investigating ${ref}.`,
  closed: (ref, actor) => `${actor} closed ${ref} with the findings and actions below.`,
  reopened: (ref, actor) => `${actor} reopened ${ref}; it is under investigation again.`,
  permit_revoked: (ref, actor) =>
    `${actor} revoked the permit named in ${ref}. The set-up may no longer be run under that permit.`,
};

export const incidentUpdateEmail: EmailBuilder<"incident_update"> = (data, ctx) => {
  const kind = data.incidentKind === "near_miss" ? "Near miss" : "Incident";
  return {
    preheader: `${data.ref}: ${data.summary}`,
    heading: `${kind} ${data.ref}: ${data.summary}`,
    tone: data.step === "permit_revoked" || data.injuries ? "danger" : data.step === "closed" ? "success" : "warn",
    blocks: [
      { type: "text", text: WHAT[data.step](data.ref, data.actorName) },
      {
        type: "facts",
        rows: [
          { label: "When", value: formatInstant(data.occurredAt, ctx.timeZone) },
          { label: "Where", value: data.location },
          { label: "Injuries", value: data.injuries ? "Yes" : "No" },
          {
            label: "State",
            value: data.state === "investigating" ? "Investigating" : data.state === "closed" ? "Closed" : "Open",
          },
          ...(data.permitNumber ? [{ label: "Permit", value: data.permitNumber }] : []),
        ],
      },
      ...(data.findings ? [{ type: "quote" as const, label: "Findings", text: data.findings }] : []),
      ...(data.actions ? [{ type: "quote" as const, label: "Actions", text: data.actions }] : []),
      { type: "action", label: "Open the report", url: appLink(ctx, `/incidents/${data.incidentId}`) },
    ],
    reason:
      data.recipient === "reporter"
        ? "You get this e-mail because you made this report in Benchclear."
        : "You get this e-mail because you are a safety officer in Benchclear.",
  };
};
