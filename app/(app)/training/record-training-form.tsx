"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field, FieldShell, controlClasses } from "@/app/_components/field";
import { ATTACHMENT_ACCEPT, ATTACHMENT_MAX_BYTES, formatBytes } from "@/lib/applications/limits";
import { apiFetch, ApiError } from "@/lib/client/api";
import { applyApiIssues } from "@/lib/client/form-errors";
import { trainingRecordSchema, type TrainingRecordBody } from "@/lib/training/schemas";

const FIELDS = ["userId", "courseTypeId", "completedOn", "trainer"] as const;

type Option = { id: string; label: string };

async function uploadCertificate(recordId: string, file: File): Promise<void> {
  const form = new FormData();
  form.append("file", file);
  const res = await fetch(`/api/training/records/${recordId}/certificate`, {
    method: "POST",
    body: form,
    credentials: "same-origin",
  });
  if (!res.ok) {
    const json = (await res.json().catch(() => undefined)) as { error?: { message?: string } } | undefined;
    throw new ApiError(res.status, json?.error?.message ?? `The certificate was not stored (${res.status}).`);
  }
}

export function RecordTrainingForm({
  people,
  courses,
  defaultPerson,
  today,
}: {
  people: Option[];
  courses: Option[];
  defaultPerson: string;
  today: string;
}) {
  const router = useRouter();
  const [status, setStatus] = useState<{ tone: "success" | "error" | "warn"; text: string } | null>(null);
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | undefined>();
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<TrainingRecordBody>({
    resolver: zodResolver(trainingRecordSchema),
    mode: "onTouched",
    defaultValues: { userId: defaultPerson, courseTypeId: courses[0]?.id ?? "", completedOn: today, trainer: "" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setStatus(null);
    if (file && file.size > ATTACHMENT_MAX_BYTES) {
      setFileError(`The file is ${formatBytes(file.size)}; at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`);
      return;
    }
    let recordId: string;
    try {
      const res = await apiFetch<{ record: { id: string } }>("/api/training/records", { body: values });
      recordId = res.record.id;
    } catch (e) {
      applyApiIssues(e, setError, { fields: [...FIELDS] });
      setStatus({ tone: "error", text: e instanceof Error ? e.message : "The course was not recorded." });
      return;
    }
    if (file) {
      try {
        await uploadCertificate(recordId, file);
      } catch (e) {
        setStatus({
          tone: "warn",
          text: `The course is recorded, but the certificate was not stored: ${e instanceof Error ? e.message : "try again"}`,
        });
        router.refresh();
        return;
      }
    }
    setStatus({ tone: "success", text: "The course is recorded." });
    reset({ ...values, trainer: "" });
    setFile(null);
    router.push(`/training?person=${values.userId}`);
    router.refresh();
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
      <FieldShell label="Person" error={errors.userId?.message} required>
        {(a11y) => (
          <select {...a11y} {...register("userId")} className={controlClasses}>
            <option value="">Choose a person</option>
            {people.map((p) => (
              <option key={p.id} value={p.id}>
                {p.label}
              </option>
            ))}
          </select>
        )}
      </FieldShell>
      <FieldShell label="Course" error={errors.courseTypeId?.message} required>
        {(a11y) => (
          <select {...a11y} {...register("courseTypeId")} className={controlClasses}>
            {courses.map((c) => (
              <option key={c.id} value={c.id}>
                {c.label}
              </option>
            ))}
          </select>
        )}
      </FieldShell>
      <Field
        label="Completed on"
        type="date"
        max={today}
        {...register("completedOn")}
        error={errors.completedOn?.message}
        required
      />
      <Field label="Trainer" {...register("trainer")} error={errors.trainer?.message} required />
      <FieldShell
        label="Certificate"
        hint={`Optional. JPEG, PNG, WebP or PDF, at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`}
        error={fileError}
      >
        {(a11y) => (
          <input
            {...a11y}
            type="file"
            accept={ATTACHMENT_ACCEPT}
            onChange={(e) => {
              setFileError(undefined);
              setFile(e.target.files?.[0] ?? null);
            }}
            className="text-sm"
          />
        )}
      </FieldShell>
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? "Recording…" : "Record the course"}
      </Button>
    </form>
  );
}
