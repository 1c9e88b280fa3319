"use client";

import { useFormContext, useFormState, useWatch } from "react-hook-form";
import { controlClasses, FieldShell } from "@/app/_components/field";
import type { Assessment, ControlRule, Tier } from "@/lib/hazard";
import { TIER_LABELS } from "@/lib/hazard";
import type { ApplicationDraft } from "@/lib/applications/schemas";
import { controlText } from "./control-text";
import { messageAt } from "./errors";

type ControlsStepProps = { tier: Tier | null; required: readonly ControlRule[]; assessment: Assessment | null };

export function ControlsStep({ tier, required, assessment }: ControlsStepProps) {
  const { control, register } = useFormContext<ApplicationDraft>();
  const { errors } = useFormState({ control });
  const entries = useWatch({ control, name: "controls.required" }) ?? [];
  const listError = messageAt(errors, "controls.required") ?? messageAt(errors, "controls.required.root");

  return (
    <div className="flex flex-col gap-5">
      {tier === null ? (
        <p className="text-sm text-stone-700">Complete the set-up on step 2 to see the controls its tier requires.</p>
      ) : required.length === 0 ? (
        <p className="text-sm text-stone-700">
          Tier {tier} ({TIER_LABELS[tier]}) requires no particular controls. Describe any you use below.
        </p>
      ) : (
        <fieldset className="flex flex-col gap-3">
          <legend className="text-sm font-medium text-stone-800">
            Controls tier {tier} ({TIER_LABELS[tier]}) requires — confirm each one
          </legend>
          <p aria-live="polite" className="text-sm text-red-800">
            {listError}
          </p>
          <ul className="flex flex-col gap-3">
            {required.map((rule) => {
              const index = entries.findIndex((e) => e.code === rule.id);
              if (index < 0) return null;
              const error = messageAt(errors, `controls.required.${index}.confirmed`);
              const errorId = `control-${rule.id}-error`;
              return (
                <li key={rule.id} className="rounded-lg border border-stone-200 bg-white p-3" data-control={rule.id}>
                  <label className="flex items-start gap-2 text-sm text-stone-900">
                    <input
                      type="checkbox"
                      className="mt-0.5 size-4"
                      aria-invalid={error ? true : undefined}
                      aria-describedby={error ? errorId : undefined}
                      {...register(`controls.required.${index}.confirmed`)}
                    />
                    <span>
                      {controlText(rule, assessment)}
                      <span className="block text-xs text-stone-600">Source: {rule.source}.</span>
                    </span>
                  </label>
                  <p id={errorId} aria-live="polite" className="text-sm text-red-800">
                    {error}
                  </p>
                  <FieldShell label={`Note on “${rule.text.replace(/\.$/, "")}”`} className="mt-2">
                    {(a11y) => (
                      <input
                        {...a11y}
                        maxLength={500}
                        autoComplete="off"
                        placeholder="How, who, where (optional)"
                        className={controlClasses}
                        {...register(`controls.required.${index}.note`)}
                      />
                    )}
                  </FieldShell>
                </li>
              );
            })}
          </ul>
        </fieldset>
      )}
      <FieldShell
        label="Additional controls"
        hint="Anything else you will have in place: screens, signage, rehearsals, first-aid cover."
        error={messageAt(errors, "controls.additional")}
      >
        {(a11y) => (
          <textarea
            {...a11y}
            rows={4}
            maxLength={4000}
            className={controlClasses}
            {...register("controls.additional")}
          />
        )}
      </FieldShell>
    </div>
  );
}
