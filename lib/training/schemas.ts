import { z } from "zod";
import { expectedVersion, signingPassword as password } from "@/lib/signing/schemas";

// Request bodies of the training endpoints, shared by the forms (zodResolver) and the server.

const isoDay = z.iso.date({ error: "Enter a date (YYYY-MM-DD)." });
const text = (max: number, what: string) =>
  z.string().trim().max(max, `Use at most ${max} characters for the ${what}.`);

/** POST /api/training/course-types: a course type the admins define. */
export const courseTypeSchema = z.object({
  name: text(120, "name").min(3, "Name the course (at least 3 characters)."),
  covers: text(1000, "description").default(""),
  /** How long a completion counts, in calendar months (a 3-year refresher is 36). */
  validityMonths: z
    .number({ error: "Enter the validity in whole months." })
    .int("Enter the validity in whole months.")
    .min(1, "At least 1 month.")
    .max(240, "At most 240 months (20 years)."),
  /** Required of every named operator from this tier up. */
  minTier: z
    .number({ error: "Choose the lowest tier that requires it." })
    .int("Choose tier 1 to 4.")
    .min(1, "Choose tier 1 to 4.")
    .max(4, "Choose tier 1 to 4."),
  /** Required in this department only; null for every department. */
  departmentId: z.uuid({ error: "Choose a department from the list." }).nullable().default(null),
});

/** PATCH /api/training/course-types/[id]: any of the fields, or retire (true) / restore (false). */
export const courseTypeUpdateSchema = courseTypeSchema
  .partial()
  .extend({ retired: z.boolean().optional() })
  .refine((v) => Object.keys(v).length > 0, { message: "Change at least one field.", path: ["name"] });

/** The form's values: numbers typed as text. */
export const courseTypeFormSchema = courseTypeSchema.extend({
  validityMonths: z.coerce
    .number({ error: "Enter the validity in whole months." })
    .int("Enter the validity in whole months.")
    .min(1, "At least 1 month.")
    .max(240, "At most 240 months (20 years)."),
  minTier: z.coerce.number().int().min(1, "Choose tier 1 to 4.").max(4, "Choose tier 1 to 4."),
});

/** POST /api/training/records: a course a person completed (the certificate is uploaded after). */
export const trainingRecordSchema = z.object({
  userId: z.uuid({ error: "Choose the person from the list." }),
  courseTypeId: z.uuid({ error: "Choose the course from the list." }),
  completedOn: isoDay,
  trainer: text(160, "trainer").min(2, "Name the trainer or training provider."),
});

export type CourseTypeBody = z.infer<typeof courseTypeSchema>;
export type CourseTypeUpdate = z.infer<typeof courseTypeUpdateSchema>;
export type TrainingRecordBody = z.infer<typeof trainingRecordSchema>;

/** GET /api/training/records: one person's record (default: your own). */
export const recordsQuerySchema = z.object({
  userId: z.preprocess((v) => (v === "" ? undefined : v), z.uuid({ error: "Not a person's id." }).optional()),
});

/**
 * POST /api/review/[id]/training-exception: the final approver lets named operators with a lapsed or
 * missing course operate under this permit, with the reason, signed with their password.
 */
export const trainingExceptionSchema = z.object({
  expectedVersion,
  reason: z
    .string()
    .trim()
    .min(10, "Give the reason for the exception (at least 10 characters).")
    .max(2000, "Use at most 2000 characters."),
  /** The permit's last day the approver intends (defaults to the proposed window's last day). */
  validTo: isoDay.optional(),
  password,
});

export type TrainingExceptionBody = z.infer<typeof trainingExceptionSchema>;
