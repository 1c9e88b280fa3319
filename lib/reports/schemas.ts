import { z } from "zod";

// The committee report's filters (/reports, its CSV and PDF): a range of institution calendar days
// and, optionally, one department. Shared by the page (which shows a refusal by its field) and the
// routes (422 naming the field).

/** The longest range a report covers: 5 years of days (a committee looks back a term or a few years). */
export const MAX_REPORT_DAYS = 5 * 366;

export const REPORT_CHARTS = ["issued", "decision-times", "returns", "active", "expiries", "incidents"] as const;
export type ReportChart = (typeof REPORT_CHARTS)[number];

const isoDay = z.iso.date({ error: "Enter a date (YYYY-MM-DD)." });

const dayNumber = (iso: string) => Date.parse(`${iso}T00:00:00Z`) / 86_400_000;

export const reportFilterSchema = z
  .object({
    from: isoDay.optional(),
    to: isoDay.optional(),
    // "" is the form's "All departments".
    department: z
      .union([z.uuid({ error: "Choose a department from the list." }), z.literal("")])
      .optional()
      .transform((v) => v || undefined),
  })
  .refine((f) => !f.from || !f.to || f.from <= f.to, { path: ["to"], message: "The end is before the start." })
  .refine((f) => !f.from || !f.to || dayNumber(f.to) - dayNumber(f.from) < MAX_REPORT_DAYS, {
    path: ["from"],
    message: `Choose a range of at most ${MAX_REPORT_DAYS} days.`,
  });

export type ReportFilterInput = { from?: string; to?: string; department?: string };

export const reportCsvQuerySchema = z
  .object({ chart: z.enum(REPORT_CHARTS, { error: `Choose a chart: ${REPORT_CHARTS.join(", ")}.` }) })
  .and(reportFilterSchema);
