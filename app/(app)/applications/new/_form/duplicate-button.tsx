"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/app/_components/button";
import { apiFetch } from "@/lib/client/api";

/** "Duplicate": a new draft from an earlier application, opened at once for its new dates. */
export function DuplicateButton({ applicationId, title }: { applicationId: string; title: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <span className="inline-flex flex-col items-end">
      <Button
        variant="ghost"
        size="sm"
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          setError(null);
          try {
            const res = await apiFetch<{ application: { id: string } }>(
              `/api/applications/${applicationId}/duplicate`,
              {
                body: {},
              },
            );
            router.push(`/applications/${res.application.id}/edit`);
          } catch (e) {
            setError(e instanceof Error ? e.message : "Not duplicated.");
            setBusy(false);
          }
        }}
      >
        {busy ? "Duplicating…" : "Duplicate"}
        <span className="sr-only"> {title}</span>
      </Button>
      {error && (
        <span role="alert" className="text-xs text-red-800">
          {error}
        </span>
      )}
    </span>
  );
}
