"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field, FieldShell, controlClasses } from "@/app/_components/field";
import { apiFetch } from "@/lib/client/api";
import { applyApiIssues } from "@/lib/client/form-errors";
import { courseTypeSchema } from "@/lib/training/schemas";

type Input = z.input<typeof courseTypeSchema>;
type Output = z.output<typeof courseTypeSchema>;

const FIELDS = ["name", "covers", "validityMonths", "minTier", "departmentId"] as const;

export function CourseTypeForm({ departments }: { departments: { id: string; name: string }[] }) {
  const router = useRouter();
  const [status, setStatus] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Input, unknown, Output>({
    resolver: zodResolver(courseTypeSchema),
    mode: "onTouched",
    defaultValues: { name: "", covers: "", validityMonths: 36, minTier: 2, departmentId: null },
  });

  const onSubmit = handleSubmit(async (values) => {
    setStatus(null);
    try {
      await apiFetch("/api/training/course-types", { body: values });
      setStatus({ tone: "success", text: `Added “${values.name}”.` });
      reset();
      router.refresh();
    } catch (e) {
      applyApiIssues(e, setError, { fields: [...FIELDS] });
      setStatus({ tone: "error", text: e instanceof Error ? e.message : "The course type was not added." });
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <div aria-live="polite">
        {status && (
          <Alert tone={status.tone} live>
            {status.text}
          </Alert>
        )}
      </div>
      <Field label="Name" {...register("name")} error={errors.name?.message} required />
      <FieldShell label="What it covers" error={errors.covers?.message}>
        {(a11y) => <textarea {...a11y} {...register("covers")} rows={3} className={controlClasses} />}
      </FieldShell>
      <Field
        label="Valid for (months)"
        type="number"
        inputMode="numeric"
        figure
        {...register("validityMonths", { valueAsNumber: true })}
        error={errors.validityMonths?.message}
        required
      />
      <FieldShell label="Required from tier" error={errors.minTier?.message} required>
        {(a11y) => (
          <select {...a11y} {...register("minTier", { valueAsNumber: true })} className={controlClasses}>
            {[1, 2, 3, 4].map((t) => (
              <option key={t} value={t}>
                Tier {t} and above
              </option>
            ))}
          </select>
        )}
      </FieldShell>
      <FieldShell label="Required in" error={errors.departmentId?.message}>
        {(a11y) => (
          <select
            {...a11y}
            {...register("departmentId", { setValueAs: (v: string) => (v ? v : null) })}
            className={controlClasses}
          >
            <option value="">Every department</option>
            {departments.map((d) => (
              <option key={d.id} value={d.id}>
                {d.name}
              </option>
            ))}
          </select>
        )}
      </FieldShell>
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? "Adding…" : "Add course type"}
      </Button>
    </form>
  );
}

/** Retires a course type (no longer required nor offered; its records stay) or restores it. */
export function RetireButton({ id, name, retired }: { id: string; name: string; retired: boolean }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  return (
    <div className="flex flex-col items-end">
      <Button
        variant="secondary"
        size="sm"
        disabled={busy}
        aria-label={`${retired ? "Restore" : "Retire"} ${name}`}
        onClick={async () => {
          setBusy(true);
          setError(null);
          try {
            await apiFetch(`/api/training/course-types/${id}`, { method: "PATCH", body: { retired: !retired } });
            router.refresh();
          } catch (e) {
            setError(e instanceof Error ? e.message : "Not changed.");
          } finally {
            setBusy(false);
          }
        }}
      >
        {retired ? "Restore" : "Retire"}
      </Button>
      {error && <p className="text-xs text-red-800">{error}</p>}
    </div>
  );
}
