import { get, type FieldErrors } from "react-hook-form";
import type { ApplicationDraft } from "@/lib/applications/schemas";

/** The message of a field's error, by its dotted form name. */
export function messageAt(errors: FieldErrors<ApplicationDraft>, name: string): string | undefined {
  const error = get(errors, name) as { message?: unknown } | undefined;
  return typeof error?.message === "string" ? error.message : undefined;
}
