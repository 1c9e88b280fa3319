import { z } from "zod";

// Request bodies of apparatus upkeep — inspection and maintenance records, the inspection interval
// and retiring — shared by the forms and the server. Pure: the forms run these same schemas.

export const INSPECTION_KIND_VALUES = ["bleeder", "jars_insulation", "grounding_hook", "maintenance"] as const;
export const INSPECTION_RESULT_VALUES = ["pass", "fail", "repaired"] as const;
export type InspectionKindValue = (typeof INSPECTION_KIND_VALUES)[number];
export type InspectionResultValue = (typeof INSPECTION_RESULT_VALUES)[number];

export const INSPECTION_KIND_LABELS: Record<InspectionKindValue, string> = {
  bleeder: "Bleeder measured",
  jars_insulation: "Jars and insulation inspected",
  grounding_hook: "Grounding hook checked",
  maintenance: "Maintenance",
};

export const INSPECTION_RESULT_LABELS: Record<InspectionResultValue, string> = {
  pass: "Passed",
  fail: "Failed",
  repaired: "Repaired",
};

/** The longest interval an admin of the bench may set: 3660 days (ten years and change). */
export const MAX_INTERVAL_DAYS = 3660;

const isoDay = z
  .string({ error: "Enter the day it was done." })
  .regex(/^\d{4}-\d{2}-\d{2}$/, { error: "Enter the day as YYYY-MM-DD." })
  .refine(
    (v) => !Number.isNaN(Date.parse(`${v}T00:00:00Z`)) && new Date(`${v}T00:00:00Z`).toISOString().startsWith(v),
    {
      error: "That day does not exist.",
    },
  );

export const inspectionSchema = z.strictObject({
  kind: z.enum(INSPECTION_KIND_VALUES, { error: "Choose what was checked." }),
  inspectedOn: isoDay,
  inspectedBy: z
    .string({ error: "Name the person who did it." })
    .trim()
    .min(1, "Name the person who did it.")
    .max(120, "Use at most 120 characters."),
  result: z.enum(INSPECTION_RESULT_VALUES, { error: "Choose passed, failed or repaired." }),
  note: z.string().trim().max(4000, "Use at most 4000 characters.").default(""),
});

export type InspectionInput = z.output<typeof inspectionSchema>;

export const upkeepSettingsSchema = z.strictObject({
  /** Days between inspections; null removes the interval (no reminders). */
  inspectionInterval_days: z
    .number({ error: "Enter the interval in days, or leave it empty for none." })
    .int({ error: "Enter a whole number of days." })
    .min(1, "Use at least 1 day.")
    .max(MAX_INTERVAL_DAYS, `Use at most ${MAX_INTERVAL_DAYS} days.`)
    .nullable(),
});

export type UpkeepSettingsInput = z.output<typeof upkeepSettingsSchema>;

export const retireSchema = z.strictObject({
  reason: z
    .string({ error: "Say why it is retired." })
    .trim()
    .min(1, "Say why it is retired.")
    .max(2000, "Use at most 2000 characters."),
});

export type RetireInput = z.output<typeof retireSchema>;
