import type { Resolver } from "react-hook-form";
import type { TierRules } from "@/lib/hazard";
import type { ApplicationDraft } from "@/lib/applications/schemas";
import type { FormStep } from "@/lib/applications/form-steps";

// The form's resolver validates only the step on screen, with the same step schemas the server runs
// on submission (step-schemas.ts). Those schemas and zod are the larger part of the form's code and
// no step needs them before its first check, so they are fetched with import() on the first edit
// (warmStepSchemas) or, at the latest, on the first "Next"; the server checks everything again.

type StepSchemas = typeof import("./step-schemas");

let loading: Promise<StepSchemas> | null = null;

/**
 * Starts (or joins) the download of the step schemas. The bundler's runtime tries a failed chunk once
 * more by itself and then keeps the failure for the page's life, so the remedy offered is a reload.
 */
export function loadStepSchemas(): Promise<StepSchemas> {
  loading ??= import("./step-schemas").catch((error: unknown) => {
    loading = null;
    throw error;
  });
  return loading;
}

/** The message shown (as an error of the whole form) when the checks could not be downloaded. */
export const CHECKS_NOT_LOADED =
  "This step could not be checked: the form's checks did not download. Reload the page once the connection is back; the draft saves itself as you type.";

export function stepResolver(
  step: FormStep,
  rules: TierRules,
  onWaiting?: (waiting: boolean) => void,
): Resolver<ApplicationDraft> {
  return async (values, context, options) => {
    if (step === 3 || step === 5) return { values, errors: {} };
    let schemas: StepSchemas;
    const timer = onWaiting ? setTimeout(() => onWaiting(true), 150) : undefined;
    try {
      schemas = await loadStepSchemas();
    } catch {
      return { values: {}, errors: { root: { type: "load", message: CHECKS_NOT_LOADED } } };
    } finally {
      clearTimeout(timer);
      onWaiting?.(false);
    }
    return schemas.resolveStep(step, rules, values, context, options);
  };
}
