"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field, FieldShell, controlClasses } from "@/app/_components/field";
import { ATTACHMENT_ACCEPT } from "@/lib/applications/limits";
import { apiFetch } from "@/lib/client/api";
import { applyApiIssues } from "@/lib/client/form-errors";
import { uploadFile } from "@/lib/client/upload";
import {
  INSPECTION_KIND_LABELS,
  INSPECTION_KIND_VALUES,
  INSPECTION_RESULT_LABELS,
  INSPECTION_RESULT_VALUES,
  inspectionSchema,
  retireSchema,
} from "@/lib/upkeep/schemas";

type Status = { tone: "success" | "error"; text: string } | null;

/** Records one inspection or maintenance, with an optional photo sent after it. */
export function InspectionForm({
  apparatusId,
  today,
  defaultName,
}: {
  apparatusId: string;
  today: string;
  defaultName: string;
}) {
  const router = useRouter();
  const [status, setStatus] = useState<Status>(null);
  const [photo, setPhoto] = useState<File | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<z.input<typeof inspectionSchema>, unknown, z.output<typeof inspectionSchema>>({
    resolver: zodResolver(inspectionSchema),
    mode: "onTouched",
    defaultValues: { kind: "bleeder", inspectedOn: today, inspectedBy: defaultName, result: "pass", note: "" },
  });
  const onSubmit = handleSubmit(async (values) => {
    setStatus(null);
    let id: string;
    try {
      const res = await apiFetch<{ inspection: { id: string } }>(`/api/apparatus/${apparatusId}/inspections`, {
        body: values,
      });
      id = res.inspection.id;
    } catch (e) {
      if (!applyApiIssues(e, setError, { fields: ["kind", "inspectedOn", "inspectedBy", "result", "note"] })) {
        setStatus({ tone: "error", text: e instanceof Error ? e.message : "Not recorded." });
      }
      return;
    }
    let text = "Recorded.";
    if (photo) {
      try {
        await uploadFile(`/api/apparatus/${apparatusId}/inspections/${id}/photo`, photo);
      } catch (e) {
        text = `Recorded, but the photo was refused: ${e instanceof Error ? e.message : "try again"}.`;
      }
    }
    reset({ ...values, note: "" });
    setPhoto(null);
    setStatus({ tone: "success", text });
    router.refresh();
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3 border-t border-stone-200 pt-3">
      <h3 className="text-sm font-semibold text-stone-900">Record an inspection</h3>
      <div aria-live="polite">{status && <Alert tone={status.tone}>{status.text}</Alert>}</div>
      <FieldShell label="What was checked" error={errors.kind?.message}>
        {(a11y) => (
          <select {...a11y} className={controlClasses} {...register("kind")}>
            {INSPECTION_KIND_VALUES.map((k) => (
              <option key={k} value={k}>
                {INSPECTION_KIND_LABELS[k]}
              </option>
            ))}
          </select>
        )}
      </FieldShell>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Day" type="date" max={today} {...register("inspectedOn")} error={errors.inspectedOn?.message} />
        <FieldShell label="Result" error={errors.result?.message}>
          {(a11y) => (
            <select {...a11y} className={controlClasses} {...register("result")}>
              {INSPECTION_RESULT_VALUES.map((r) => (
                <option key={r} value={r}>
                  {INSPECTION_RESULT_LABELS[r]}
                </option>
              ))}
            </select>
          )}
        </FieldShell>
      </div>
      <Field label="Done by" {...register("inspectedBy")} error={errors.inspectedBy?.message} />
      <FieldShell label="Note" hint="Readings with units, e.g. “bleeder 498 MΩ”." error={errors.note?.message}>
        {(a11y) => <textarea {...a11y} rows={2} className={controlClasses} {...register("note")} />}
      </FieldShell>
      <FieldShell label="Photo" hint="Optional: JPEG, PNG, WebP or PDF, at most 10 MB.">
        {(a11y) => (
          <input
            {...a11y}
            type="file"
            accept={ATTACHMENT_ACCEPT}
            onChange={(e) => setPhoto(e.target.files?.[0] ?? null)}
            className="text-sm"
          />
        )}
      </FieldShell>
      <Button type="submit" variant="secondary" disabled={isSubmitting} aria-busy={isSubmitting || undefined}>
        {isSubmitting ? "Recording…" : "Record"}
      </Button>
    </form>
  );
}

/** Adds the photo of a record that has none. */
export function RecordPhoto({ apparatusId, inspectionId }: { apparatusId: string; inspectionId: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  return (
    <label className="mt-1 block text-xs text-stone-700">
      Add a photo{" "}
      <input
        type="file"
        accept={ATTACHMENT_ACCEPT}
        className="text-xs"
        onChange={async (e) => {
          const file = e.target.files?.[0];
          if (!file) return;
          setError(null);
          try {
            await uploadFile(`/api/apparatus/${apparatusId}/inspections/${inspectionId}/photo`, file);
            router.refresh();
          } catch (err) {
            setError(err instanceof Error ? err.message : "The photo was not added.");
          }
        }}
      />
      {error && <span className="block text-red-800">{error}</span>}
    </label>
  );
}

/** Sets or clears the number of days between inspections. */
export function IntervalForm({ apparatusId, current }: { apparatusId: string; current: number | null }) {
  const router = useRouter();
  const [value, setValue] = useState(current === null ? "" : String(current));
  const [error, setError] = useState<string | undefined>();
  const [busy, setBusy] = useState(false);
  async function save(event: React.FormEvent) {
    event.preventDefault();
    setError(undefined);
    const trimmed = value.trim();
    const days = trimmed === "" ? null : Number(trimmed);
    if (days !== null && !Number.isInteger(days)) {
      setError("Enter a whole number of days, or leave it empty for none.");
      return;
    }
    setBusy(true);
    try {
      await apiFetch(`/api/apparatus/${apparatusId}/upkeep`, {
        method: "PATCH",
        body: { inspectionInterval_days: days },
      });
      router.refresh();
    } catch (e) {
      setError(e instanceof Error ? e.message : "Not saved.");
    } finally {
      setBusy(false);
    }
  }
  return (
    <form onSubmit={save} noValidate className="flex items-end gap-2 border-t border-stone-200 pt-3">
      <Field
        label="Inspect every (days)"
        name="inspectionInterval_days"
        inputMode="numeric"
        value={value}
        onChange={(e) => setValue(e.target.value)}
        error={error}
        hint="The owner is e-mailed when it is due. Empty: no interval."
        fieldClassName="flex-1"
        figure
      />
      <Button type="submit" variant="secondary" disabled={busy}>
        Save
      </Button>
    </form>
  );
}

/** Retires the apparatus with a reason. */
export function RetireForm({ apparatusId }: { apparatusId: string }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<z.input<typeof retireSchema>, unknown, z.output<typeof retireSchema>>({
    resolver: zodResolver(retireSchema),
    defaultValues: { reason: "" },
  });
  const [status, setStatus] = useState<string | null>(null);
  if (!open) {
    return (
      <div className="border-t border-stone-200 pt-3">
        <Button variant="ghost" size="sm" onClick={() => setOpen(true)}>
          Retire this apparatus…
        </Button>
      </div>
    );
  }
  const onSubmit = handleSubmit(async (values) => {
    setStatus(null);
    try {
      await apiFetch(`/api/apparatus/${apparatusId}/retire`, { body: values });
      router.refresh();
    } catch (e) {
      if (!applyApiIssues(e, setError, { fields: ["reason"] })) {
        setStatus(e instanceof Error ? e.message : "Not retired.");
      }
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3 border-t border-stone-200 pt-3">
      <div aria-live="polite">{status && <Alert tone="error">{status}</Alert>}</div>
      <p className="text-stone-700">
        A retired apparatus keeps its revisions and records but is no longer offered for new applications. Permits
        already issued over it stay as they are.
      </p>
      <FieldShell label="Why it is retired" required error={errors.reason?.message}>
        {(a11y) => <textarea {...a11y} rows={2} className={controlClasses} {...register("reason")} />}
      </FieldShell>
      <Button type="submit" variant="danger" disabled={isSubmitting}>
        {isSubmitting ? "Retiring…" : "Retire"}
      </Button>
    </form>
  );
}
