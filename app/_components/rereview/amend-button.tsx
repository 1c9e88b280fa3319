"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { apiFetch } from "@/lib/client/api";

/** The holder starts an amendment: a new draft pre-filled from the permit with the changed apparatus. */
export function AmendButton({ permitId }: { permitId: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function amend() {
    setBusy(true);
    setError(null);
    try {
      const result = await apiFetch<{ editUrl: string }>(`/api/permits/${permitId}/amend`, { body: {} });
      router.push(result.editUrl);
    } catch (e) {
      setError(e instanceof Error ? e.message : "The amendment was not started.");
      setBusy(false);
    }
  }
  return (
    <div className="flex flex-col gap-2">
      <div aria-live="polite">{error && <Alert tone="error">{error}</Alert>}</div>
      <Button onClick={amend} disabled={busy} aria-busy={busy || undefined} className="self-start">
        {busy ? "Starting…" : "Start an amendment"}
      </Button>
    </div>
  );
}
