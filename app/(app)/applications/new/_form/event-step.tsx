"use client";

import { useFieldArray, useFormContext, useFormState } from "react-hook-form";
import { Button } from "@/app/_components/button";
import { controlClasses, Field, FieldShell } from "@/app/_components/field";
import { AUDIENCE_LABELS, AUDIENCES, EVENT_KIND_LABELS, EVENT_KINDS } from "@/lib/applications/form-steps";
import type { ApplicationDraft } from "@/lib/applications/schemas";
import { messageAt } from "./errors";
import { PersonField } from "./person-field";

export function EventStep() {
  const { control, register } = useFormContext<ApplicationDraft>();
  const { errors } = useFormState({ control });
  const operators = useFieldArray({ control, name: "event.operators" });
  const audienceError = messageAt(errors, "event.audience");
  const operatorsError = messageAt(errors, "event.operators") ?? messageAt(errors, "event.operators.root");

  return (
    <div className="grid gap-4 sm:grid-cols-2">
      <Field
        label="Title"
        required
        maxLength={160}
        autoComplete="off"
        fieldClassName="sm:col-span-2"
        error={messageAt(errors, "event.title")}
        {...register("event.title")}
      />
      <FieldShell label="Kind of event" required error={messageAt(errors, "event.kind")}>
        {(a11y) => (
          <select {...a11y} {...register("event.kind")} className={controlClasses}>
            <option value="">Choose…</option>
            {EVENT_KINDS.map((k) => (
              <option key={k} value={k}>
                {EVENT_KIND_LABELS[k]}
              </option>
            ))}
          </select>
        )}
      </FieldShell>
      <Field
        label="Room or place"
        required
        maxLength={120}
        autoComplete="off"
        error={messageAt(errors, "event.room")}
        {...register("event.room")}
      />
      <fieldset className="sm:col-span-2" aria-describedby={audienceError ? "audience-error" : undefined}>
        <legend className="text-sm font-medium text-stone-800">
          Audience <span className="ml-1 font-normal text-stone-500">(required)</span>
        </legend>
        <div className="mt-1 flex flex-wrap gap-x-5 gap-y-1">
          {AUDIENCES.map((a) => (
            <label key={a} className="flex items-center gap-2 text-sm text-stone-800">
              <input type="radio" value={a} className="size-4" {...register("event.audience")} />
              {AUDIENCE_LABELS[a]}
            </label>
          ))}
        </div>
        <p id="audience-error" aria-live="polite" className="text-sm text-red-800">
          {audienceError}
        </p>
      </fieldset>
      <Field
        label="Audience size"
        hint="People expected at once; 0 or empty for no audience."
        inputMode="numeric"
        maxLength={9}
        autoComplete="off"
        figure
        error={messageAt(errors, "event.audienceSize")}
        {...register("event.audienceSize")}
      />
      <div className="hidden sm:block" />
      <Field
        label="First day"
        type="date"
        required
        error={messageAt(errors, "event.firstDay")}
        {...register("event.firstDay")}
      />
      <Field
        label="Last day"
        type="date"
        required
        error={messageAt(errors, "event.lastDay")}
        {...register("event.lastDay")}
      />
      <div className="sm:col-span-2">
        <PersonField name="event.responsible" label="Responsible person" required />
      </div>
      <fieldset className="flex flex-col gap-3 sm:col-span-2">
        <legend className="mb-1 text-sm font-medium text-stone-800">Operators</legend>
        <p className="text-xs text-stone-600">
          People who run the set-up. From tier 2, at least one must be trained and current on it.
        </p>
        <p aria-live="polite" className="text-sm text-red-800">
          {operatorsError}
        </p>
        {operators.fields.map((field, index) => (
          <div
            key={field.id}
            className="rounded-lg border border-stone-200 bg-stone-50/60 p-3"
            data-testid={`operator-${index}`}
          >
            <PersonField name={`event.operators.${index}`} label={`Operator ${index + 1}`} required />
            <div className="mt-2 flex flex-wrap items-center justify-between gap-2">
              <label className="flex items-center gap-2 text-sm text-stone-800">
                <input type="checkbox" className="size-4" {...register(`event.operators.${index}.trained`)} />
                Trained and current on this apparatus
              </label>
              <Button variant="ghost" size="sm" onClick={() => operators.remove(index)}>
                Remove operator {index + 1}
              </Button>
            </div>
          </div>
        ))}
        <div>
          <Button
            variant="secondary"
            size="sm"
            disabled={operators.fields.length >= 20}
            onClick={() => operators.append({ userId: null, name: "", trained: false })}
          >
            Add operator
          </Button>
        </div>
      </fieldset>
    </div>
  );
}
