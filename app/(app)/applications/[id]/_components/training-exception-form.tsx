"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field, FieldShell, controlClasses } from "@/app/_components/field";
import { ApiError, apiFetch } from "@/lib/client/api";
import { issuesByField } from "@/lib/client/form-errors";

// The final approver's signed training exception: a reason and the password, like a decision.

const KEYS = ["reason", "password", "validTo"] as const;

export function TrainingExceptionForm(props: {
  applicationId: string;
  version: number;
  throughDay: string;
  gaps: string[];
}) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [password, setPassword] = useState("");
  const [errors, setErrors] = useState<Partial<Record<(typeof KEYS)[number], string>>>({});
  const [status, setStatus] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  if (!open) {
    return (
      <Button variant="secondary" size="sm" className="mt-3" onClick={() => setOpen(true)}>
        Record a training exception
      </Button>
    );
  }

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setStatus(null);
    setBusy(true);
    try {
      await apiFetch(`/api/review/${props.applicationId}/training-exception`, {
        body: { expectedVersion: props.version, reason, password, validTo: props.throughDay },
      });
      setPassword("");
      router.refresh();
    } catch (error) {
      setPassword("");
      setErrors(error instanceof ApiError ? issuesByField(error, KEYS) : {});
      setStatus(error instanceof Error ? error.message : "The exception was not recorded.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} noValidate className="mt-4 flex flex-col gap-3 border-t border-stone-200 pt-3">
      <p className="text-sm text-stone-700">
        You accept that {props.gaps.join("; ")} may operate under this permit through {props.throughDay}. Your name,
        role, the time and your reason are signed and recorded with this revision.
      </p>
      <div aria-live="polite">{status && <Alert tone="error">{status}</Alert>}</div>
      <FieldShell label="Reason for the exception" required error={errors.reason}>
        {(a11y) => (
          <textarea
            {...a11y}
            rows={3}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            className={controlClasses}
          />
        )}
      </FieldShell>
      <Field
        label="Your password"
        name="exception-password"
        type="password"
        autoComplete="current-password"
        required
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        error={errors.password}
      />
      <Button type="submit" disabled={busy} aria-busy={busy || undefined}>
        {busy ? "Signing…" : "Sign the exception"}
      </Button>
    </form>
  );
}
