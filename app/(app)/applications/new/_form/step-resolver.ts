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

// The form's resolver validates only the step on screen, with the same step schemas the server runs
// on submission. It keeps the values as typed (raw), so moving on never rewrites what was written.

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

export function stepResolver(step: FormStep, rules: TierRules): Resolver<ApplicationDraft> {
  return async (values, context, options) => {
    const schema = stepSchema(step, values, rules);
    if (!schema) return { values, errors: {} };
    const resolve = zodResolver(schema, undefined, { raw: true }) as unknown as Resolver<ApplicationDraft>;
    const result = await resolve(values, context, options);
    return Object.keys(result.errors).length > 0 ? { values: {}, errors: result.errors } : { values, errors: {} };
  };
}
