"use client";

import { useState } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { apiFetch } from "@/lib/client/api";

// The button that starts signing in through the institution's provider (POST
// /api/session/institution, then a full navigation to the provider). Used by the sign-in page and,
// with `reauth`, by the signing panels: a decision needs a fresh sign-in there.

export function InstitutionSignIn({
  name,
  from,
  reauth = false,
  label,
  variant,
}: {
  name: string;
  from: string;
  reauth?: boolean;
  label?: string;
  variant?: "primary" | "secondary";
}) {
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function start() {
    setError(null);
    setBusy(true);
    try {
      const result = await apiFetch<{ redirectTo: string }>("/api/session/institution", { body: { from, reauth } });
      window.location.assign(result.redirectTo);
    } catch (e) {
      setError(e instanceof Error ? e.message : "Could not start the sign-in.");
      setBusy(false);
    }
  }

  return (
    <div className="flex flex-col gap-2">
      {error && (
        <Alert tone="error" live>
          {error}
        </Alert>
      )}
      <Button variant={variant} onClick={start} disabled={busy}>
        {busy ? "Opening your institution's sign-in…" : (label ?? `Sign in with ${name}`)}
      </Button>
    </div>
  );
}
