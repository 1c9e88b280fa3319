import { z } from "zod";
import { setupInputSchema } from "./setup";

// The application's content: what the form edits as a draft and what a submission freezes into an
// application revision (the thing decisions sign). The permit PDF, the review diff and the e-mails
// read this shape; keep it stable and extend it only with optional fields.

export const EVENT_KINDS = ["lecture_demonstration", "outreach_event", "teaching_lab", "research_bench"] as const;
export const EVENT_KIND_LABELS: Record<(typeof EVENT_KINDS)[number], string> = {
  lecture_demonstration: "Lecture demonstration",
  outreach_event: "Outreach event",
  teaching_lab: "Teaching lab",
  research_bench: "Research bench",
};
export const AUDIENCES = ["none", "students", "public"] as const;
export const AUDIENCE_LABELS: Record<(typeof AUDIENCES)[number], string> = {
  none: "No audience",
  students: "Students",
  public: "Members of the public",
};

const isoDay = z.iso.date({ error: "Enter a date (YYYY-MM-DD)." });
const shortText = (max: number, what: string) =>
  z.string().trim().max(max, `Use at most ${max} characters for the ${what}.`);

/** A person named on the application: a user of Arcwarden (userId) or someone outside it (name only). */
export const namedPersonSchema = z.object({
  userId: z.uuid().nullable(),
  name: shortText(120, "name").min(1, "Enter the person's name."),
  /** Operators: trained for this apparatus and current (tier 2+ requires it). */
  trained: z.boolean().optional(),
});

export const eventSchema = z
  .object({
    title: shortText(160, "title").min(3, "Give the event a title (at least 3 characters)."),
    kind: z.enum(EVENT_KINDS, { error: "Choose the kind of event." }),
    room: shortText(120, "room").min(1, "Enter the room or place."),
    audience: z.enum(AUDIENCES, { error: "Choose the audience." }),
    audienceSize: z.number().int("Enter a whole number.").min(0, "Cannot be negative.").max(100_000, "Too large."),
    firstDay: isoDay,
    lastDay: isoDay,
    responsible: namedPersonSchema,
    operators: z.array(namedPersonSchema).max(20, "Name at most 20 operators."),
  })
  .refine((e) => e.lastDay >= e.firstDay, {
    path: ["lastDay"],
    message: "The last day is before the first day.",
  })
  .refine((e) => e.audience === "none" || e.audienceSize > 0, {
    path: ["audienceSize"],
    message: "Enter the expected audience size.",
  });

export const apparatusPartSchema = z.object({
  /** The registry record and revision used, or null when described only in this application. */
  apparatusId: z.uuid().nullable(),
  apparatusRevisionId: z.uuid().nullable(),
  name: shortText(160, "apparatus name").min(1, "Name the apparatus."),
  room: shortText(120, "room"),
  notes: shortText(4000, "notes"),
  setup: setupInputSchema,
});

export const controlsSchema = z.object({
  /** One entry per control the tier requires (codes from lib/hazard requiredControls). */
  required: z.array(
    z.object({
      code: z.string().min(1).max(80),
      text: z.string().max(400),
      confirmed: z.boolean(),
      note: shortText(500, "note"),
    }),
  ),
  additional: shortText(4000, "additional controls"),
});

export const attachmentRefSchema = z.object({
  id: z.uuid(),
  filename: z.string().max(255),
  contentType: z.string().max(100),
  size_B: z.number().int().nonnegative(),
  sha256: z.string().length(64),
});

export const attestationSchema = z.object({
  accepted: z.literal(true, { error: "Confirm the attestation to submit." }),
  /** The exact text the applicant confirmed, kept with the revision. */
  text: z.string().min(1).max(2000),
});

/** A complete application, as frozen into a revision on submission. */
export const applicationContentSchema = z.object({
  event: eventSchema,
  apparatus: apparatusPartSchema,
  controls: controlsSchema,
  attachments: z.array(attachmentRefSchema).max(10),
  attestation: attestationSchema,
});

export type NamedPerson = z.infer<typeof namedPersonSchema>;
export type EventDetails = z.infer<typeof eventSchema>;
export type ApparatusPart = z.infer<typeof apparatusPartSchema>;
export type Controls = z.infer<typeof controlsSchema>;
export type AttachmentRef = z.infer<typeof attachmentRefSchema>;
export type ApplicationContent = z.infer<typeof applicationContentSchema>;
