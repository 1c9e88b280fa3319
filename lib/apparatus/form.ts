import { z } from "zod";
import { apparatusCreateSchema, setupTextSchema } from "@/lib/apparatus/schemas";
import { setupFromText } from "./setup-text";

// The registry form's schema: the set-up as typed, checked field by field as the server will check
// it, and turned into SI numbers for the request body (which the server validates again).

export const setupTextToInputSchema = setupTextSchema.transform((text, ctx) => {
  const { setup, issues } = setupFromText(text);
  for (const issue of issues) ctx.addIssue({ code: "custom", path: issue.path, message: issue.message });
  return setup ?? z.NEVER;
});

export const apparatusFormSchema = z.object({
  name: apparatusCreateSchema.shape.name,
  room: apparatusCreateSchema.shape.room,
  notes: apparatusCreateSchema.shape.notes,
  setup: setupTextToInputSchema,
});

export type ApparatusFormValues = z.input<typeof apparatusFormSchema>;

/** "apparatus.setup.sources[0].id" (a server path) → "apparatus.setup.sources.0.label" (a form field). */
export function fieldNameOf(path: string): string {
  return path.replace(/\[(\d+)\]/g, ".$1").replace(/(sources\.\d+)\.id$/, "$1.label");
}
