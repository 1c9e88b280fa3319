"use client";

import { useState } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { apiFetch } from "@/lib/client/api";

/**
 * The personal calendar feed of permit validity windows. Its address is a secret shown once when
 * created; creating it again replaces it (the old address stops working).
 */
export function CalendarFeed({ exists: initiallyExists }: { exists: boolean }) {
  const [exists, setExists] = useState(initiallyExists);
  const [url, setUrl] = useState<string | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function run(action: () => Promise<void>) {
    setBusy(true);
    setMessage(null);
    try {
      await action();
    } catch (e) {
      setMessage(e instanceof Error ? e.message : "That did not work.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="flex flex-col gap-3 text-sm text-stone-700">
      <p>Subscribe in your calendar app to see when your permits start and end.</p>
      {url && (
        <Alert tone="success" live title="Your feed address (shown once)">
          <code className="break-all">{url}</code>
        </Alert>
      )}
      <div className="flex flex-wrap gap-2">
        <Button
          size="sm"
          disabled={busy}
          onClick={() =>
            run(async () => {
              const res = await apiFetch<{ url: string }>("/api/me/calendar-token", { body: {} });
              setUrl(res.url);
              setExists(true);
            })
          }
        >
          {exists ? "Replace feed address" : "Create feed address"}
        </Button>
        {exists && (
          <Button
            size="sm"
            variant="secondary"
            disabled={busy}
            onClick={() =>
              run(async () => {
                await apiFetch("/api/me/calendar-token", { method: "DELETE", body: {} });
                setUrl(null);
                setExists(false);
              })
            }
          >
            Remove feed
          </Button>
        )}
      </div>
      <p aria-live="polite">{message}</p>
    </div>
  );
}
