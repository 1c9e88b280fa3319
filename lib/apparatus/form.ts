import { z } from "zod";
import { apparatusCreateSchema, setupTextSchema } from "@/lib/apparatus/schemas";
import { setupFromText } from "./setup-text";

// In a module of its own (no zod), for forms that map server paths before their schemas load.
export { fieldNameOf } from "./field-name";

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
