import { z } from "zod";
import { setupFromText } from "@/lib/apparatus/setup-text";
import { setupTextSchema } from "@/lib/apparatus/schemas";
import { setupInputSchema } from "@/lib/apparatus/setup-schema";
import { AUDIENCES, EVENT_KINDS } from "./form-steps";

// The form's names for source kinds, for screens that read an application's content (lib/review sits
// above applications and does not import apparatus).
export { SOURCE_KIND_LABELS } from "@/lib/apparatus/schemas";
// The form's plain constants live in form-steps.ts (no zod), re-exported for the server's readers.
export {
  AUDIENCE_LABELS,
  AUDIENCES,
  EVENT_KIND_LABELS,
  EVENT_KINDS,
  FORM_STEPS,
  STEP_TITLES,
  type FormStep,
} from "./form-steps";

// The application's content: what the form edits as a draft and what a submission freezes into an
// application revision (the thing decisions sign). The permit PDF, the review diff and the e-mails
// read this shape; keep it stable and extend it only with optional fields.

const isoDay = z.iso.date({ error: "Enter a date (YYYY-MM-DD)." });
const shortText = (max: number, what: string) =>
  z.string().trim().max(max, `Use at most ${max} characters for the ${what}.`);

/** A person named on the application: a user of Benchclear (userId) or someone outside it (name only). */
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
  .refine((e) => e.lastDay >= e.firstDay, { path: ["lastDay"], message: "The last day is before the first day." })
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

// ---------------------------------------------------------------------------------------------------
// Drafts and steps. A draft is the form's working copy, autosaved as typed: every field is text or a
// flag, nothing is required and the caps are generous, so a save never fails on a half-filled or
// invalid field. The step schemas turn one part of a draft into its content part, with each problem
// on the field's own path; the form runs them before moving on, the server runs them on submission.

/** Versions are PostgreSQL integers; a larger number names no version (and must not reach SQL). */
const PG_INT_MAX = 2_147_483_647;

const draftText = (max: number) =>
  z
    .string()
    .max(max, { error: `Use at most ${max} characters.` })
    .default("");

export const namedPersonDraftSchema = z.object({
  userId: z.uuid({ error: "Choose a person from the list." }).nullable().default(null),
  name: draftText(400),
  trained: z.boolean().default(false),
});

export const eventDraftSchema = z.object({
  title: draftText(600),
  kind: z.enum([...EVENT_KINDS, ""]).default(""),
  room: draftText(400),
  audience: z.enum([...AUDIENCES, ""]).default(""),
  audienceSize: draftText(40),
  firstDay: draftText(40),
  lastDay: draftText(40),
  responsible: namedPersonDraftSchema.prefault({}),
  operators: z.array(namedPersonDraftSchema).max(20, { error: "Name at most 20 operators." }).default([]),
});

export const apparatusDraftSchema = z.object({
  apparatusId: z.uuid().nullable().default(null),
  apparatusRevisionId: z.uuid().nullable().default(null),
  name: draftText(600),
  room: draftText(400),
  notes: draftText(12_000),
  setup: setupTextSchema.prefault({}),
});

export const controlsDraftSchema = z.object({
  /** The applicant's answer per control code; codes the current tier no longer needs are kept. */
  required: z
    .array(
      z.object({
        code: z.string().min(1).max(80),
        confirmed: z.boolean().default(false),
        note: draftText(1500),
      }),
    )
    .max(60)
    .default([]),
  additional: draftText(12_000),
});

export const applicationDraftSchema = z.object({
  event: eventDraftSchema.prefault({}),
  apparatus: apparatusDraftSchema.prefault({}),
  controls: controlsDraftSchema.prefault({}),
  attestation: z.object({ accepted: z.boolean().default(false) }).prefault({}),
});

export type ApplicationDraft = z.output<typeof applicationDraftSchema>;
export type EventDraft = z.output<typeof eventDraftSchema>;
export type ApparatusDraft = z.output<typeof apparatusDraftSchema>;
export type ControlsDraft = z.output<typeof controlsDraftSchema>;

/** PATCH /api/applications/[id]/draft: the whole draft, the step the user is on, the version edited. */
export const draftSaveSchema = z.strictObject({
  expectedVersion: z.number({ error: "Send the version you edited (expectedVersion)." }).int().min(1).max(PG_INT_MAX),
  step: z.number().int().min(1).max(6).default(1),
  draft: applicationDraftSchema,
});

/** POST /api/applications: a new draft, optionally started from a registry apparatus. */
export const draftCreateSchema = z.strictObject({
  draft: applicationDraftSchema.optional(),
  apparatusId: z.uuid().optional(),
});

/** POST …/submit and …/withdraw: the version the user saw. */
export const versionedActionSchema = z.strictObject({
  expectedVersion: z.number({ error: "Send the version you saw (expectedVersion)." }).int().min(1).max(PG_INT_MAX),
});

type Ctx = z.core.$RefinementCtx;

function addAll(ctx: Ctx, issues: readonly z.core.$ZodIssue[], skip?: (path: PropertyKey[]) => boolean) {
  for (const issue of issues) {
    if (skip?.(issue.path)) continue;
    ctx.addIssue({ code: "custom", path: issue.path, message: issue.message });
  }
}

/** Days as YYYY-MM-DD in UTC; a day of slack keeps browser and server agreeing across time zones. */
function yesterdayUtc(now: Date): string {
  return new Date(now.getTime() - 86_400_000).toISOString().slice(0, 10);
}

/** Step 1: the event draft → EventDetails. */
export const eventStepSchema = eventDraftSchema.transform((d, ctx) => {
  const sizeText = d.audienceSize.trim();
  let audienceSize: number | null;
  if (sizeText === "") audienceSize = 0;
  else if (/^\d{1,9}$/.test(sizeText)) audienceSize = Number(sizeText);
  else audienceSize = null;
  if (audienceSize === null) {
    ctx.addIssue({ code: "custom", path: ["audienceSize"], message: "Enter the audience size as a whole number." });
  }
  const person = (p: z.output<typeof namedPersonDraftSchema>) => ({
    userId: p.userId,
    name: p.name,
    ...(p.trained ? { trained: true } : {}),
  });
  const parsed = eventSchema.safeParse({
    title: d.title,
    kind: d.kind || undefined,
    room: d.room,
    audience: d.audience || undefined,
    audienceSize: audienceSize ?? 0,
    firstDay: d.firstDay.trim() || undefined,
    lastDay: d.lastDay.trim() || undefined,
    responsible: person(d.responsible),
    operators: d.operators.map(person),
  });
  if (!parsed.success) {
    addAll(ctx, parsed.error.issues, (path) => audienceSize === null && path[0] === "audienceSize");
    return z.NEVER;
  }
  if (parsed.data.lastDay < yesterdayUtc(new Date())) {
    ctx.addIssue({ code: "custom", path: ["lastDay"], message: "The last day is in the past." });
    return z.NEVER;
  }
  if (audienceSize === null) return z.NEVER;
  return parsed.data;
});

const apparatusHeadSchema = apparatusPartSchema.omit({ setup: true });

/** Step 2: the apparatus draft (set-up as typed) → ApparatusPart with the set-up in SI base units. */
export const apparatusStepSchema = apparatusDraftSchema.transform((d, ctx) => {
  const head = apparatusHeadSchema.safeParse({
    apparatusId: d.apparatusId,
    apparatusRevisionId: d.apparatusRevisionId,
    name: d.name,
    room: d.room,
    notes: d.notes,
  });
  if (!head.success) addAll(ctx, head.error.issues);
  const { setup, issues } = setupFromText(d.setup);
  for (const issue of issues) ctx.addIssue({ code: "custom", path: ["setup", ...issue.path], message: issue.message });
  if (!head.success || !setup) return z.NEVER;
  return { ...head.data, setup };
});

/**
 * Step 4: every control the tier requires, confirmed. `required` is requiredControls(tier, rules);
 * issues point at the draft's own entry for the control, so the form shows them at its checkbox.
 */
export function controlsStepSchema(required: readonly { id: string; text: string }[]) {
  return controlsDraftSchema.transform((d, ctx) => {
    const out: Controls["required"] = [];
    for (const control of required) {
      const index = d.required.findIndex((entry) => entry.code === control.id);
      const entry = index >= 0 ? d.required[index] : undefined;
      if (!entry?.confirmed) {
        ctx.addIssue({
          code: "custom",
          path: index >= 0 ? ["required", index, "confirmed"] : ["required"],
          message: `Confirm this control: ${control.text}`,
        });
        continue;
      }
      out.push({ code: control.id, text: control.text, confirmed: true, note: entry.note.trim() });
    }
    const parsed = controlsSchema.safeParse({ required: out, additional: d.additional });
    if (!parsed.success) {
      addAll(ctx, parsed.error.issues, (path) => path[0] === "required");
      return z.NEVER;
    }
    return parsed.data;
  });
}

/** Step 6: the attestation box. */
export const attestationStepSchema = z.object({
  accepted: z.literal(true, { error: "Confirm the attestation to submit." }),
});

export const APPLICATION_SORTS = ["updated", "title", "state", "tier", "submitted"] as const;
export type ApplicationSort = (typeof APPLICATION_SORTS)[number];

const firstValue = (value: unknown) => (Array.isArray(value) ? value[0] : value);
const blankToUndefined = (value: unknown) => {
  const one = firstValue(value);
  return one === "" ? undefined : one;
};

/** GET /api/applications and the /applications page: my applications, paged on the server. */
export const applicationListQuerySchema = z.object({
  page: z.preprocess(firstValue, z.coerce.number().int().min(1).max(100_000).default(1)),
  pageSize: z.preprocess(firstValue, z.coerce.number().int().min(5).max(100).default(20)),
  sort: z.preprocess(firstValue, z.enum(APPLICATION_SORTS).default("updated")),
  dir: z.preprocess(firstValue, z.enum(["asc", "desc"]).default("desc")),
  state: z.preprocess(
    blankToUndefined,
    z.enum(["draft", "submitted", "in_review", "returned", "approved", "rejected", "withdrawn"]).optional(),
  ),
});
export type ApplicationListQuery = z.output<typeof applicationListQuerySchema>;

/** GET /api/applications/people: people to name on an application. */
export const peopleQuerySchema = z.object({
  q: z.preprocess(firstValue, z.string().trim().min(2, { error: "Type at least 2 letters." }).max(100)),
});
