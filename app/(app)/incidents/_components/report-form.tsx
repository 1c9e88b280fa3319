"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Controller, useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field, FieldShell, controlClasses } from "@/app/_components/field";
import { ATTACHMENT_ACCEPT, ATTACHMENT_MAX_COUNT } from "@/lib/applications/limits";
import { apiFetch } from "@/lib/client/api";
import { applyApiIssues } from "@/lib/client/form-errors";
import { uploadFile } from "@/lib/client/upload";
import { INCIDENT_KIND_LABELS, INCIDENT_KIND_VALUES, incidentReportSchema } from "@/lib/incidents/schemas";

type Choice = { id: string; label: string };
type FormInput = z.input<typeof incidentReportSchema>;
type FormOutput = z.output<typeof incidentReportSchema>;

const FIELDS = [
  "kind",
  "summary",
  "description",
  "occurredAt",
  "location",
  "injuries",
  "injuryNote",
  "permitId",
  "apparatusId",
] as const;

/** The report: what, when, where, injuries, an optional permit and apparatus, and photos. */
export function ReportForm({
  permits,
  apparatus,
  defaults,
  timeZone,
}: {
  permits: Choice[];
  apparatus: Choice[];
  defaults: { permitId: string; apparatusId: string; occurredAt: string };
  timeZone: string;
}) {
  const router = useRouter();
  const [files, setFiles] = useState<File[]>([]);
  const [status, setStatus] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormInput, unknown, FormOutput>({
    resolver: zodResolver(incidentReportSchema),
    mode: "onTouched",
    defaultValues: {
      kind: "near_miss",
      summary: "",
      description: "",
      occurredAt: defaults.occurredAt,
      location: "",
      injuryNote: "",
      permitId: defaults.permitId || null,
      apparatusId: defaults.apparatusId || null,
    },
  });
  const injuries = useWatch({ control, name: "injuries" });

  const onSubmit = handleSubmit(async (values) => {
    setStatus(null);
    let id: string;
    try {
      const res = await apiFetch<{ incident: { id: string } }>("/api/incidents", { body: values });
      id = res.incident.id;
    } catch (e) {
      if (!applyApiIssues(e, setError, { fields: FIELDS })) {
        setStatus(e instanceof Error ? e.message : "The report was not sent.");
      }
      return;
    }
    // The report is stored; photos follow one by one, and a refused one does not undo it.
    const refused: string[] = [];
    for (const file of files) {
      try {
        await uploadFile(`/api/incidents/${id}/photos`, file);
      } catch (e) {
        refused.push(e instanceof Error ? e.message : file.name);
      }
    }
    router.push(refused.length ? `/incidents/${id}?photos=refused` : `/incidents/${id}`);
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex max-w-2xl flex-col gap-4">
      <div aria-live="polite">{status && <Alert tone="error">{status}</Alert>}</div>
      <fieldset className="flex flex-col gap-1">
        <legend className="text-sm font-medium text-stone-800">What kind of report</legend>
        <div className="flex flex-wrap gap-4">
          {INCIDENT_KIND_VALUES.map((kind) => (
            <label key={kind} className="flex items-center gap-2 text-sm">
              <input type="radio" value={kind} {...register("kind")} />
              {INCIDENT_KIND_LABELS[kind]}
              <span className="text-stone-600">
                {kind === "incident"
                  ? "(someone was hurt or something was damaged)"
                  : "(nobody was hurt, but could have been)"}
              </span>
            </label>
          ))}
        </div>
      </fieldset>
      <Field label="In a line, what happened" required {...register("summary")} error={errors.summary?.message} />
      <FieldShell
        label="Describe it"
        required
        error={errors.description?.message}
        hint="What was running, what happened, what was done straight after."
      >
        {(a11y) => <textarea {...a11y} rows={6} className={controlClasses} {...register("description")} />}
      </FieldShell>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field
          label="When"
          type="datetime-local"
          required
          hint={`Time in ${timeZone}.`}
          {...register("occurredAt")}
          error={errors.occurredAt?.message}
        />
        <Field label="Where" required {...register("location")} error={errors.location?.message} />
      </div>
      <Controller
        control={control}
        name="injuries"
        render={({ field }) => (
          <fieldset className="flex flex-col gap-1" aria-describedby="injuries-error">
            <legend className="text-sm font-medium text-stone-800">
              Was anyone hurt? <span className="font-normal text-stone-500">(required)</span>
            </legend>
            <div className="flex gap-4">
              {(
                [
                  [true, "Yes"],
                  [false, "No"],
                ] as const
              ).map(([value, label]) => (
                <label key={label} className="flex items-center gap-2 text-sm">
                  <input
                    type="radio"
                    name={field.name}
                    checked={field.value === value}
                    onChange={() => field.onChange(value)}
                    onBlur={field.onBlur}
                  />
                  {label}
                </label>
              ))}
            </div>
            <p id="injuries-error" aria-live="polite" className="text-sm text-red-800">
              {errors.injuries?.message}
            </p>
          </fieldset>
        )}
      />
      {injuries === true && (
        <FieldShell
          label="Injuries"
          hint="Who, what kind, first aid or treatment given."
          error={errors.injuryNote?.message}
        >
          {(a11y) => <textarea {...a11y} rows={3} className={controlClasses} {...register("injuryNote")} />}
        </FieldShell>
      )}
      <div className="grid gap-4 sm:grid-cols-2">
        <FieldShell label="Permit" hint="Optional: the permit the set-up ran under." error={errors.permitId?.message}>
          {(a11y) => (
            <select {...a11y} className={controlClasses} {...register("permitId", { setValueAs: (v) => v || null })}>
              <option value="">None</option>
              {permits.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.label}
                </option>
              ))}
            </select>
          )}
        </FieldShell>
        <FieldShell label="Apparatus" hint="Optional: the registry record." error={errors.apparatusId?.message}>
          {(a11y) => (
            <select {...a11y} className={controlClasses} {...register("apparatusId", { setValueAs: (v) => v || null })}>
              <option value="">None</option>
              {apparatus.map((a) => (
                <option key={a.id} value={a.id}>
                  {a.label}
                </option>
              ))}
            </select>
          )}
        </FieldShell>
      </div>
      <FieldShell
        label="Photos"
        hint={`Optional: up to ${ATTACHMENT_MAX_COUNT} JPEG, PNG, WebP or PDF files, at most 10 MB each.`}
      >
        {(a11y) => (
          <input
            {...a11y}
            type="file"
            multiple
            accept={ATTACHMENT_ACCEPT}
            onChange={(e) => setFiles(Array.from(e.target.files ?? []).slice(0, ATTACHMENT_MAX_COUNT))}
            className="text-sm"
          />
        )}
      </FieldShell>
      <div>
        <Button type="submit" disabled={isSubmitting} aria-busy={isSubmitting || undefined}>
          {isSubmitting ? "Sending…" : "Send the report"}
        </Button>
      </div>
    </form>
  );
}
