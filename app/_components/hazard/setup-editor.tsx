"use client";

import { useId } from "react";
import { get, useFieldArray, useFormContext, useFormState, useWatch, type FieldValues } from "react-hook-form";
import {
  BODY_RESISTANCE_FIELD,
  defaultSourceLabel,
  emptyBleederText,
  emptyGapText,
  emptySourceText,
  GAP_FIELDS,
  SOURCE_FIELDS,
  sourceTextId,
  upgradeSetupText,
} from "@/lib/apparatus/setup-text";
import { SOURCE_KIND_LABELS, SOURCE_KINDS, type SetupText, type SourceKindName } from "@/lib/apparatus/schemas";
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

type AcrossChoiceProps = {
  legend: string;
  hint: string;
  /** Source ids (labels) to choose from, with their shown names. */
  choices: { id: string; name: string }[];
  selected: readonly string[];
  onChange: (next: string[]) => void;
  error?: string;
};

/** "Connected across": which of the set-up's sources a gap or a bleeder is wired across. */
function AcrossChoice({ legend, hint, choices, selected, onChange, error }: AcrossChoiceProps) {
  const id = useId();
  const stale = selected.filter((name) => !choices.some((c) => c.id === name));
  return (
    <fieldset className="sm:col-span-2" aria-describedby={`${id}-hint${error ? ` ${id}-error` : ""}`}>
      <legend className="text-sm font-medium text-stone-900">{legend}</legend>
      <p id={`${id}-hint`} className="text-xs text-stone-600">
        {hint}
      </p>
      <div className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
        {choices.length === 0 && <span className="text-sm text-stone-600">Add an energy source first.</span>}
        {choices.map((choice) => (
          <label key={choice.id} className="flex items-center gap-2 text-sm text-stone-800">
            <input
              type="checkbox"
              className="size-4"
              checked={selected.includes(choice.id)}
              onChange={(event) =>
                onChange(
                  event.target.checked
                    ? [...selected.filter((s) => s !== choice.id), choice.id]
                    : selected.filter((s) => s !== choice.id),
                )
              }
            />
            {choice.name}
          </label>
        ))}
      </div>
      {stale.length > 0 && (
        <p className="mt-1 text-sm text-amber-900">
          Also names {stale.join(", ")}, which is no longer a source of this set-up.{" "}
          <button
            type="button"
            className="underline"
            onClick={() => onChange(selected.filter((s) => !stale.includes(s)))}
          >
            Remove
          </button>
        </p>
      )}
      {error && (
        <p id={`${id}-error`} className="mt-1 text-sm text-red-800">
          {error}
        </p>
      )}
    </fieldset>
  );
}

export function SetupEditor({ prefix, headingLevel = 3 }: SetupEditorProps) {
  const { control, register, setValue } = useFormContext<FieldValues>();
  const { errors } = useFormState({ control });
  const setup = (useWatch({ control, name: prefix }) ?? {}) as Partial<SetupText>;
  const sources = useFieldArray({ control, name: `${prefix}.sources` });
  const gaps = useFieldArray({ control, name: `${prefix}.gaps` });
  const bleeders = useFieldArray({ control, name: `${prefix}.bleeders` });
  const choices = (setup.sources ?? []).map((source, index) => ({
    id: sourceTextId(source, index),
    name: `${sourceTextId(source, index)} (${SOURCE_KIND_LABELS[source.kind]})`,
  }));
  const bleedable = (setup.sources ?? [])
    .map((source, index) => ({ source, choice: choices[index] }))
    .filter(({ source }) => source.kind !== "ac-supply")
    .map(({ choice }) => choice);
  // Gaps typed before gaps were wired: shown as connected across the voltage-less sphere terminals.
  const upgrade = upgradeSetupText({
    sources: setup.sources ?? [],
    gaps: setup.gaps ?? [],
    bleeders: setup.bleeders ?? [],
    bodyResistance_ohm: setup.bodyResistance_ohm ?? "",
    vacuumDevice: setup.vacuumDevice ?? false,
  });
  const shownGaps = upgrade.text.gaps;
  const setAcross = (name: string, next: string[]) =>
    setValue(name, next, { shouldDirty: true, shouldValidate: true, shouldTouch: true });
  // A source added as a capacitor gets "C2"; when its kind is changed and the label is still the one
  // the editor gave it, the label follows the kind ("Terminal 2", not "C2"), and so do the gaps and
  // bleeders wired across it. A label the user typed is kept.
  const followKind = (index: number, previous: SourceKindName, next: SourceKindName) => {
    const label = (setup.sources?.[index]?.label ?? "").trim();
    if (label !== "" && label !== defaultSourceLabel(previous, index)) return;
    const oldId = sourceTextId({ label }, index);
    const nextLabel = defaultSourceLabel(next, index);
    setValue(`${prefix}.sources.${index}.label`, nextLabel, { shouldDirty: true });
    const rename = (list: readonly string[] | undefined) => (list ?? []).map((id) => (id === oldId ? nextLabel : id));
    (setup.gaps ?? []).forEach((gap, i) => {
      if (gap.across?.includes(oldId)) setAcross(`${prefix}.gaps.${i}.across`, rename(gap.across));
    });
    (setup.bleeders ?? []).forEach((bleeder, i) => {
      if (bleeder.across?.includes(oldId)) setAcross(`${prefix}.bleeders.${i}.across`, rename(bleeder.across));
    });
  };
  const confirmWiring = () =>
    shownGaps.forEach((gap, index) => setAcross(`${prefix}.gaps.${index}.across`, gap.across ?? []));
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
                    <select
                      {...a11y}
                      {...register(`${name}.kind`, {
                        onChange: (event: React.ChangeEvent<HTMLSelectElement>) =>
                          followKind(index, kind, event.target.value as SourceKindName),
                      })}
                      className={controlClasses}
                    >
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
          <Button
            variant="secondary"
            size="sm"
            onClick={() => gaps.append(emptyGapText(choices.length === 1 ? [choices[0].id] : []))}
          >
            Add spark gap
          </Button>
        </div>
        {gaps.fields.length === 0 && (
          <p className="text-sm text-stone-600">
            No spark gaps. A gap caps the voltage of the sources it is connected across, and nothing else.
          </p>
        )}
        {upgrade.rewired && (
          <div role="status" className="rounded border border-amber-300 bg-amber-50 p-3 text-sm text-amber-950">
            <p>
              These gaps were saved before each gap said which sources it is connected across. They are now taken as
              connected across the sphere terminals with no voltage of their own, and nothing else. Check each gap
              below, then confirm the wiring.
            </p>
            <Button variant="secondary" size="sm" className="mt-2" onClick={confirmWiring}>
              Confirm the wiring
            </Button>
          </div>
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
                <AcrossChoice
                  legend="Connected across"
                  hint="The sources this gap sparks across. It caps only these; a gap across nothing caps nothing."
                  choices={choices}
                  selected={shownGaps[index]?.across ?? []}
                  onChange={(next) => setAcross(`${name}.across`, next)}
                  error={errorAt(errors, `${name}.across`)}
                />
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

      <section aria-labelledby={`${baseId}-bleeders`} className="flex flex-col gap-3">
        <div className="flex items-center justify-between gap-3">
          <H id={`${baseId}-bleeders`} className="text-base font-semibold text-stone-900">
            Bleeders across several sources
          </H>
          <Button
            variant="secondary"
            size="sm"
            onClick={() => bleeders.append(emptyBleederText(bleedable.length === 1 ? [bleedable[0].id] : []))}
          >
            Add bleeder
          </Button>
        </div>
        {bleeders.fields.length === 0 && (
          <p className="text-sm text-stone-600">
            A bleeder of one bank goes with that bank above. Add one here when a resistor discharges several sources
            together, or a sphere terminal.
          </p>
        )}
        {bleeders.fields.map((field, index) => {
          const name = `${prefix}.bleeders.${index}`;
          const current = setup.bleeders?.[index];
          return (
            <fieldset key={field.id} className="rounded-lg border border-stone-200 bg-stone-50/60 p-3">
              <legend className="px-1 text-sm font-semibold text-stone-900">Bleeder {index + 1}</legend>
              <div className="grid gap-3 sm:grid-cols-2">
                <Field
                  label="Label"
                  hint="R1, Shorting resistor."
                  maxLength={80}
                  autoComplete="off"
                  error={errorAt(errors, `${name}.label`)}
                  {...register(`${name}.label`)}
                />
                <QuantityInput
                  label="Resistance"
                  dimension="resistance"
                  example="200 MΩ"
                  required
                  maxLength={60}
                  text={current?.resistance_ohm ?? ""}
                  error={errorAt(errors, `${name}.resistance_ohm`)}
                  {...register(`${name}.resistance_ohm`)}
                />
                <AcrossChoice
                  legend="Connected across"
                  hint="Every source this resistor discharges; the time to safe uses their capacitance together."
                  choices={bleedable}
                  selected={current?.across ?? []}
                  onChange={(next) => setAcross(`${name}.across`, next)}
                  error={errorAt(errors, `${name}.across`)}
                />
              </div>
              <div className="mt-3 flex justify-end">
                <Button variant="ghost" size="sm" onClick={() => bleeders.remove(index)}>
                  Remove bleeder {index + 1}
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
