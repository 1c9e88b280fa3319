"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { FieldShell, controlClasses } from "@/app/_components/field";
import { ATTACHMENT_ACCEPT } from "@/lib/applications/limits";
import { apiFetch } from "@/lib/client/api";
import { applyApiIssues } from "@/lib/client/form-errors";
import { uploadFile } from "@/lib/client/upload";
import { INCIDENT_STATE_LABELS, incidentTriageSchema, type IncidentStateValue } from "@/lib/incidents/schemas";

type TriageIn = z.input<typeof incidentTriageSchema>;
type TriageOut = z.output<typeof incidentTriageSchema>;

/** An officer moves the report on and records findings and actions. */
export function TriageForm(props: {
  incidentId: string;
  version: number;
  state: IncidentStateValue;
  moves: IncidentStateValue[];
  findings: string;
  actions: string;
}) {
  const router = useRouter();
  const [status, setStatus] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<TriageIn, unknown, TriageOut>({
    resolver: zodResolver(incidentTriageSchema),
    mode: "onTouched",
    defaultValues: {
      expectedVersion: props.version,
      state: props.moves[0] ?? props.state,
      findings: props.findings,
      actions: props.actions,
    },
  });
  const onSubmit = handleSubmit(async (values) => {
    setStatus(null);
    try {
      await apiFetch(`/api/incidents/${props.incidentId}`, { method: "PATCH", body: values });
      setStatus({ tone: "success", text: "Saved." });
      router.refresh();
    } catch (e) {
      if (!applyApiIssues(e, setError, { fields: ["state", "findings", "actions"] })) {
        setStatus({ tone: "error", text: e instanceof Error ? e.message : "Not saved." });
      }
    }
  });
  const options = [props.state, ...props.moves];
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      <div aria-live="polite">{status && <Alert tone={status.tone}>{status.text}</Alert>}</div>
      <FieldShell label="State" error={errors.state?.message}>
        {(a11y) => (
          <select {...a11y} className={controlClasses} {...register("state")}>
            {options.map((s) => (
              <option key={s} value={s}>
                {s === props.state ? `${INCIDENT_STATE_LABELS[s]} (now)` : INCIDENT_STATE_LABELS[s]}
              </option>
            ))}
          </select>
        )}
      </FieldShell>
      <FieldShell label="Findings" error={errors.findings?.message} hint="Needed to close the report.">
        {(a11y) => <textarea {...a11y} rows={4} className={controlClasses} {...register("findings")} />}
      </FieldShell>
      <FieldShell label="Actions" error={errors.actions?.message} hint="What was or will be done; needed to close.">
        {(a11y) => <textarea {...a11y} rows={4} className={controlClasses} {...register("actions")} />}
      </FieldShell>
      <Button type="submit" disabled={isSubmitting} aria-busy={isSubmitting || undefined}>
        {isSubmitting ? "Saving…" : "Save"}
      </Button>
    </form>
  );
}

/** Adds photos to a report that is not closed (the reporter or an officer). */
export function PhotoUpload({ incidentId }: { incidentId: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function add(list: FileList | null) {
    setError(null);
    setBusy(true);
    for (const file of Array.from(list ?? [])) {
      try {
        await uploadFile(`/api/incidents/${incidentId}/photos`, file);
      } catch (e) {
        setError(e instanceof Error ? e.message : "The photo was not added.");
      }
    }
    setBusy(false);
    router.refresh();
  }
  return (
    <div className="mt-3">
      <FieldShell label="Add photos" hint="JPEG, PNG, WebP or PDF, at most 10 MB each." error={error ?? undefined}>
        {(a11y) => (
          <input
            {...a11y}
            type="file"
            multiple
            accept={ATTACHMENT_ACCEPT}
            disabled={busy}
            onChange={(e) => void add(e.target.files)}
            className="text-sm"
          />
        )}
      </FieldShell>
    </div>
  );
}
