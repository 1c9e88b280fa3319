"use client";

import { useId } from "react";
import { get, useFieldArray, useFormContext, useFormState, useWatch, type FieldValues } from "react-hook-form";
import {
  BODY_RESISTANCE_FIELD,
  defaultSourceLabel,
  emptyGapText,
  emptySourceText,
  GAP_FIELDS,
  SOURCE_FIELDS,
} from "@/lib/apparatus/setup-text";
import { SOURCE_KIND_LABELS, SOURCE_KINDS, type SetupText, type SourceKindName } from "@/lib/validation/apparatus";
import { Button } from "../button";
import { cx } from "../cx";
import { controlClasses, Field, FieldShell } from "../field";
import { QuantityInput } from "./quantity-input";

// The energy sources and spark gaps of a set-up, as typed text, inside any react-hook-form form
// (FormProvider) at `prefix` ("setup" in the registry form, "apparatus.setup" in the application).
// Each field shows what it reads as; the parent recomputes the figures from the same text.

type SetupEditorProps = {
  prefix: string;
  /** Heading level for "Energy sources" and "Spark gaps". */
  headingLevel?: 2 | 3;
};

function errorAt(errors: FieldValues, name: string): string | undefined {
  const error = get(errors, name) as { message?: unknown } | undefined;
  return typeof error?.message === "string" ? error.message : undefined;
}

export function SetupEditor({ prefix, headingLevel = 3 }: SetupEditorProps) {
  const { control, register } = useFormContext<FieldValues>();
  const { errors } = useFormState({ control });
  const setup = (useWatch({ control, name: prefix }) ?? {}) as Partial<SetupText>;
  const sources = useFieldArray({ control, name: `${prefix}.sources` });
  const gaps = useFieldArray({ control, name: `${prefix}.gaps` });
  const H = headingLevel === 2 ? "h2" : "h3";
  const baseId = useId();
  const sourcesError = errorAt(errors, `${prefix}.sources`) ?? errorAt(errors, `${prefix}.sources.root`);

  return (
    <div className="flex flex-col gap-6">
      <section aria-labelledby={`${baseId}-sources`} className="flex flex-col gap-3">
        <div className="flex items-center justify-between gap-3">
          <H id={`${baseId}-sources`} className="text-base font-semibold text-stone-900">
            Energy sources
          </H>
          <Button
            variant="secondary"
            size="sm"
            onClick={() =>
              sources.append(emptySourceText("capacitor", defaultSourceLabel("capacitor", sources.fields.length)))
            }
          >
            Add energy source
          </Button>
        </div>
        <p aria-live="polite" className="text-sm text-red-800">
          {sourcesError}
        </p>
        {sources.fields.length === 0 && (
          <p className="text-sm text-stone-600">
            No energy sources yet. Add each capacitor or bank, sphere terminal and supply of the set-up.
          </p>
        )}
        {sources.fields.map((field, index) => {
          const name = `${prefix}.sources.${index}`;
          const current = setup.sources?.[index];
          const kind = (current?.kind ?? "capacitor") as SourceKindName;
          return (
            <fieldset
              key={field.id}
              className="rounded-lg border border-stone-200 bg-stone-50/60 p-3"
              data-testid={`source-${index}`}
            >
              <legend className="px-1 text-sm font-semibold text-stone-900">
                Energy source {index + 1}
                {current?.label ? `: ${current.label}` : ""}
              </legend>
              <div className="grid gap-3 sm:grid-cols-2">
                <FieldShell label="Kind" error={errorAt(errors, `${name}.kind`)}>
                  {(a11y) => (
                    <select {...a11y} {...register(`${name}.kind`)} className={controlClasses}>
                      {SOURCE_KINDS.map((k) => (
                        <option key={k} value={k}>
                          {SOURCE_KIND_LABELS[k]}
                        </option>
                      ))}
                    </select>
                  )}
                </FieldShell>
                <Field
                  label="Label"
                  hint="How people know it: C1, Terminal, HV supply."
                  maxLength={80}
                  autoComplete="off"
                  error={errorAt(errors, `${name}.label`)}
                  {...register(`${name}.label`)}
                />
                {SOURCE_FIELDS[kind].map((spec) => (
                  <QuantityInput
                    key={spec.name}
                    label={spec.label}
                    dimension={spec.dimension}
                    example={spec.example}
                    hint={spec.hint}
                    required={spec.required}
                    maxLength={60}
                    text={current?.[spec.name] ?? ""}
                    error={errorAt(errors, `${name}.${spec.name}`)}
                    {...register(`${name}.${spec.name}`)}
                  />
                ))}
                {kind === "capacitor" && (
                  <>
                    <Field
                      label="Number of units"
                      hint="Identical capacitors in the bank; empty for one."
                      inputMode="numeric"
                      maxLength={12}
                      autoComplete="off"
                      figure
                      error={errorAt(errors, `${name}.count`)}
                      {...register(`${name}.count`)}
                    />
                    <FieldShell label="Arrangement" error={errorAt(errors, `${name}.arrangement`)}>
                      {(a11y) => (
                        <select {...a11y} {...register(`${name}.arrangement`)} className={controlClasses}>
                          <option value="">Parallel (default)</option>
                          <option value="parallel">Parallel</option>
                          <option value="series">Series</option>
                        </select>
                      )}
                    </FieldShell>
                  </>
                )}
              </div>
              <div className="mt-3 flex justify-end">
                <Button variant="ghost" size="sm" onClick={() => sources.remove(index)}>
                  Remove energy source {index + 1}
                </Button>
              </div>
            </fieldset>
          );
        })}
      </section>

      <section aria-labelledby={`${baseId}-gaps`} className="flex flex-col gap-3">
        <div className="flex items-center justify-between gap-3">
          <H id={`${baseId}-gaps`} className="text-base font-semibold text-stone-900">
            Spark gaps
          </H>
          <Button variant="secondary" size="sm" onClick={() => gaps.append(emptyGapText())}>
            Add spark gap
          </Button>
        </div>
        {gaps.fields.length === 0 && (
          <p className="text-sm text-stone-600">
            No spark gaps. A gap across the stored energy caps the voltage every source can reach.
          </p>
        )}
        {gaps.fields.map((field, index) => {
          const name = `${prefix}.gaps.${index}`;
          const current = setup.gaps?.[index];
          return (
            <fieldset key={field.id} className="rounded-lg border border-stone-200 bg-stone-50/60 p-3">
              <legend className="px-1 text-sm font-semibold text-stone-900">Spark gap {index + 1}</legend>
              <div className="grid gap-3 sm:grid-cols-2">
                {GAP_FIELDS.map((spec) => (
                  <QuantityInput
                    key={spec.name}
                    label={spec.label}
                    dimension={spec.dimension}
                    example={spec.example}
                    hint={spec.hint}
                    required={spec.required}
                    maxLength={60}
                    text={current?.[spec.name] ?? ""}
                    error={errorAt(errors, `${name}.${spec.name}`)}
                    {...register(`${name}.${spec.name}`)}
                  />
                ))}
              </div>
              <div className="mt-3 flex justify-end">
                <Button variant="ghost" size="sm" onClick={() => gaps.remove(index)}>
                  Remove spark gap {index + 1}
                </Button>
              </div>
            </fieldset>
          );
        })}
      </section>

      <section aria-label="Body model and vacuum devices" className="grid gap-3 sm:grid-cols-2">
        <QuantityInput
          label={BODY_RESISTANCE_FIELD.label}
          dimension={BODY_RESISTANCE_FIELD.dimension}
          example={BODY_RESISTANCE_FIELD.example}
          hint={BODY_RESISTANCE_FIELD.hint}
          maxLength={60}
          text={setup.bodyResistance_ohm ?? ""}
          error={errorAt(errors, `${prefix}.bodyResistance_ohm`)}
          {...register(`${prefix}.bodyResistance_ohm`)}
        />
        <label className={cx("flex items-start gap-2 self-center text-sm text-stone-800")}>
          <input type="checkbox" className="mt-0.5 size-4" {...register(`${prefix}.vacuumDevice`)} />
          <span>
            A tube or vacuum gap is driven
            <span className="block text-xs text-stone-600">Above 10 kV it can make x-rays.</span>
          </span>
        </label>
      </section>
    </div>
  );
}
