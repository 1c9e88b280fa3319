"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert } from "@/app/_components/alert";
import { SignerCheck, type SigningProps } from "@/app/_components/auth/signer-check";
import { Button } from "@/app/_components/button";
import { FieldShell, controlClasses } from "@/app/_components/field";
import { ApiError, apiFetch } from "@/lib/client/api";
import { issuesByField } from "@/lib/client/form-errors";

/** The holder starts a renewal: a new draft prefilled from this permit, opened in the form. */
export function RenewButton({ permitId }: { permitId: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function renew() {
    setBusy(true);
    setError(null);
    try {
      const result = await apiFetch<{ editUrl: string }>(`/api/permits/${permitId}/renew`, { body: {} });
      router.push(result.editUrl);
    } catch (e) {
      setError(e instanceof Error ? e.message : "The renewal was not started.");
      setBusy(false);
    }
  }
  return (
    <div className="flex flex-col gap-2">
      <div aria-live="polite">{error && <Alert tone="error">{error}</Alert>}</div>
      <Button onClick={renew} disabled={busy} aria-busy={busy || undefined}>
        {busy ? "Starting…" : "Renew this permit"}
      </Button>
    </div>
  );
}

/** A safety officer revokes the permit: a reason and their password, recorded as a signed decision. */
export function RevokeForm({
  permitId,
  version,
  signing,
}: {
  permitId: string;
  version: number;
  signing: SigningProps;
}) {
  const router = useRouter();
  const [reason, setReason] = useState("");
  const [password, setPassword] = useState("");
  const [errors, setErrors] = useState<{ reason?: string; password?: string }>({});
  const [status, setStatus] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    const local: typeof errors = {};
    if (!reason.trim()) local.reason = "Give the reason for revoking.";
    if (signing.method === "password" && !password) local.password = "Enter your password to sign.";
    if (signing.method === "institution" && !signing.fresh)
      local.password = "Confirm it is you through your institution's sign-in first.";
    setErrors(local);
    setStatus(null);
    if (Object.keys(local).length) return;
    setBusy(true);
    try {
      await apiFetch(`/api/permits/${permitId}/revoke`, {
        body: { expectedVersion: version, reason, password: password || undefined },
      });
      setStatus({ tone: "success", text: "The permit is revoked. The holder is told by e-mail." });
      setPassword("");
      router.refresh();
    } catch (e) {
      setPassword("");
      if (e instanceof ApiError) setErrors(issuesByField(e, ["reason", "password"]));
      setStatus({ tone: "error", text: e instanceof Error ? e.message : "The permit was not revoked." });
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-3">
      <div aria-live="polite">{status && <Alert tone={status.tone}>{status.text}</Alert>}</div>
      <FieldShell label="Reason" required error={errors.reason}>
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
      <SignerCheck
        signing={signing}
        password={password}
        onPassword={setPassword}
        error={errors.password}
        hint="Revoking is signed: it needs your password again."
      />
      <Button type="submit" variant="danger" disabled={busy} aria-busy={busy || undefined}>
        {busy ? "Revoking…" : "Revoke the permit"}
      </Button>
    </form>
  );
}
