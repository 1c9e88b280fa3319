"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { apiFetch } from "@/lib/client/api";

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
