"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert } from "@/app/_components/alert";
import { SignerCheck, type SigningProps } from "@/app/_components/auth/signer-check";
import { Button } from "@/app/_components/button";
import { FieldShell, controlClasses } from "@/app/_components/field";
import { ApiError, apiFetch } from "@/lib/client/api";
import { issuesByField } from "@/lib/client/form-errors";

// A safety officer revokes a permit: a reason and a signature, confirmed the way this person signs
// (their password, or a fresh sign-in through the institution: SignerCheck, decided by
// lib/signing/password.ts). One form for every place a permit is revoked from — the permit's page
// (/api/permits/[id]/revoke) and an incident report naming it (/api/incidents/[id]/revoke-permit) —
// so both offer the same ways to sign.

export function RevokeForm({
  action,
  version,
  signing,
}: {
  /** The route that revokes: it takes { expectedVersion, reason, password? }. */
  action: string;
  /** The permit's version as shown. */
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
      await apiFetch(action, { body: { expectedVersion: version, reason, password: password || undefined } });
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
