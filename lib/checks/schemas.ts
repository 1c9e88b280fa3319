import { z } from "zod";
import type { PreUseAnswer } from "@/db/schema/checks";

// The pre-use check as the phone sends it, shared by the form (zodResolver) and the route. Which
// items a permit's checklist has is decided on the server (lib/checks/checklist.ts); here only the
// shape. Browser-safe: no server imports.

export const PRE_USE_ANSWERS = ["yes", "no", "na"] as const satisfies readonly PreUseAnswer[];

export const ANSWER_LABELS: Record<PreUseAnswer, string> = { yes: "Yes", no: "No", na: "Not applicable" };

export const CHECK_NOTE_MAX = 500;
export const CHECK_ITEMS_MAX = 60;

export const checkItemAnswerSchema = z.strictObject({
  id: z.string().regex(/^(general|control|condition):[a-z0-9-]{1,80}$/, "This is not a checklist item."),
  answer: z.enum(PRE_USE_ANSWERS, { error: "Answer yes, no or not applicable." }),
  note: z.string().trim().max(CHECK_NOTE_MAX, `At most ${CHECK_NOTE_MAX} characters.`).default(""),
  photoId: z.uuid({ error: "This photo was not uploaded." }).nullable().default(null),
});

export const recordCheckSchema = z.strictObject({
  // One key per check, made by the phone and kept with the answers: a submit sent again after a
  // lost answer finds the check already recorded instead of recording it twice.
  idempotencyKey: z.uuid({ error: "The check's key is missing; reload the page." }),
  items: z
    .array(checkItemAnswerSchema)
    .min(1, "Answer the checklist.")
    .max(CHECK_ITEMS_MAX, `At most ${CHECK_ITEMS_MAX} items.`),
  note: z.string().trim().max(1000, "At most 1000 characters.").default(""),
});

export type RecordCheckBody = z.output<typeof recordCheckSchema>;
export type RecordCheckInput = z.input<typeof recordCheckSchema>;
