import { zodResolver } from "@hookform/resolvers/zod";
import type { Resolver } from "react-hook-form";
import { z } from "zod";
import { draftAssessment } from "@/lib/applications/draft";
import { requiredControls, type TierRules } from "@/lib/hazard";
import {
  apparatusStepSchema,
  attestationStepSchema,
  controlsStepSchema,
  eventStepSchema,
  type ApplicationDraft,
  type FormStep,
} from "@/lib/applications/schemas";

// The step schemas as the form runs them: the same ones the server runs on submission. This module
// (with zod and the engine it needs for step 4) is loaded by step-resolver.ts when first needed.

export function stepSchema(step: FormStep, draft: ApplicationDraft, rules: TierRules) {
  switch (step) {
    case 1:
      return z.object({ event: eventStepSchema });
    case 2:
      return z.object({ apparatus: apparatusStepSchema });
    case 4: {
      const assessment = draftAssessment(draft, rules);
      return z.object({ controls: controlsStepSchema(assessment ? requiredControls(assessment.tier, rules) : []) });
    }
    case 6:
      return z.object({ attestation: attestationStepSchema });
    default:
      return null;
  }
}

/** Validates the step on screen, keeping the values as typed (raw), so moving on never rewrites them. */
export async function resolveStep(
  step: FormStep,
  rules: TierRules,
  ...[values, context, options]: Parameters<Resolver<ApplicationDraft>>
): Promise<Awaited<ReturnType<Resolver<ApplicationDraft>>>> {
  const schema = stepSchema(step, values, rules);
  if (!schema) return { values, errors: {} };
  const resolve = zodResolver(schema, undefined, { raw: true }) as unknown as Resolver<ApplicationDraft>;
  const result = await resolve(values, context, options);
  return Object.keys(result.errors).length > 0 ? { values: {}, errors: result.errors } : { values, errors: {} };
}
