import { z } from "zod";
import { expectedVersion, signingPassword } from "@/lib/signing/schemas";

// Request bodies of the incident endpoints, shared by the report and triage forms and the server.
// Pure (no server imports): the forms run these same schemas in the browser.

export const INCIDENT_KIND_VALUES = ["incident", "near_miss"] as const;
export const INCIDENT_STATE_VALUES = ["open", "investigating", "closed"] as const;
export type IncidentKindValue = (typeof INCIDENT_KIND_VALUES)[number];
export type IncidentStateValue = (typeof INCIDENT_STATE_VALUES)[number];

export const INCIDENT_KIND_LABELS: Record<IncidentKindValue, string> = {
  incident: "Incident",
  near_miss: "Near miss",
};

export const INCIDENT_STATE_LABELS: Record<IncidentStateValue, string> = {
  open: "Open",
  investigating: "Investigating",
  closed: "Closed",
};

/** The moves an officer may make; closing a report again after reopening it is allowed. */
export const INCIDENT_MOVES: Record<IncidentStateValue, readonly IncidentStateValue[]> = {
  open: ["investigating", "closed"],
  investigating: ["closed"],
  closed: ["investigating"],
};

/** "IR-42": the human reference of a report. */
export function incidentRef(seq: number): string {
  return `IR-${seq}`;
}

// A wall-clock time as a datetime-local field gives it ("2026-12-01T14:30", in the institution's
// zone), or an instant with its offset ("2026-12-01T14:30:00Z").
const LOCAL_TIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/;
const occurredAt = z
  .string({ error: "Enter when it happened." })
  .trim()
  .min(1, "Enter when it happened.")
  .refine((v) => LOCAL_TIME.test(v) || z.iso.datetime({ offset: true }).safeParse(v).success, {
    error: "Enter the date and time it happened (YYYY-MM-DD HH:MM).",
  });

const optionalId = (what: string) =>
  z.preprocess(
    (v) => (v === "" ? null : v),
    z
      .uuid({ error: `Pick the ${what} from the list, or leave it empty.` })
      .nullable()
      .default(null),
  );

export const incidentReportSchema = z.strictObject({
  kind: z.enum(INCIDENT_KIND_VALUES, { error: "Choose incident or near miss." }),
  summary: z
    .string({ error: "Say in a line what happened." })
    .trim()
    .min(1, "Say in a line what happened.")
    .max(160, "Use at most 160 characters for the summary."),
  description: z
    .string({ error: "Describe what happened." })
    .trim()
    .min(1, "Describe what happened.")
    .max(8000, "Use at most 8000 characters."),
  occurredAt,
  location: z
    .string({ error: "Enter where it happened." })
    .trim()
    .min(1, "Enter where it happened.")
    .max(160, "Use at most 160 characters for the place."),
  injuries: z.boolean({ error: "Say whether anyone was hurt." }),
  injuryNote: z.string().trim().max(2000, "Use at most 2000 characters.").default(""),
  permitId: optionalId("permit"),
  apparatusId: optionalId("apparatus"),
});

export type IncidentReportInput = z.output<typeof incidentReportSchema>;

const longText = z.string().trim().max(8000, "Use at most 8000 characters.");

/** PATCH /api/incidents/[id]: an officer's step. Closing needs findings (checked with the state). */
export const incidentTriageSchema = z
  .strictObject({
    expectedVersion,
    state: z.enum(INCIDENT_STATE_VALUES, { error: "Choose open, investigating or closed." }),
    findings: longText.default(""),
    actions: longText.default(""),
  })
  .superRefine((body, ctx) => {
    if (body.state === "closed" && !body.findings) {
      ctx.addIssue({ code: "custom", path: ["findings"], message: "Record the findings before closing the report." });
    }
    if (body.state === "closed" && !body.actions) {
      ctx.addIssue({
        code: "custom",
        path: ["actions"],
        message: "Record the actions taken (or “none needed”) before closing the report.",
      });
    }
  });

export type IncidentTriageInput = z.output<typeof incidentTriageSchema>;

/** POST /api/incidents/[id]/revoke-permit: the permit's revoke body, the permit's version. */
export const incidentRevokeSchema = z.strictObject({
  expectedVersion,
  password: signingPassword,
  reason: z.string().trim().min(1, "Give the reason for revoking.").max(2000, "Use at most 2000 characters."),
});

export type IncidentRevokeInput = z.output<typeof incidentRevokeSchema>;

const oneValue = (value: unknown) => (Array.isArray(value) ? value[0] : value);

export const incidentListQuerySchema = z.object({
  state: z.preprocess(
    (v) => (oneValue(v) === "" ? undefined : oneValue(v)),
    z.enum(INCIDENT_STATE_VALUES, { error: "Filter by open, investigating or closed." }).optional(),
  ),
  permitId: z.preprocess(oneValue, z.uuid({ error: "Not a permit id." }).optional()),
  apparatusId: z.preprocess(oneValue, z.uuid({ error: "Not an apparatus id." }).optional()),
  page: z.preprocess(oneValue, z.coerce.number().int().min(1).max(100_000).default(1)),
});

export type IncidentListQuery = z.output<typeof incidentListQuerySchema>;
