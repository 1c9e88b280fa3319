"use client";

import { useState } from "react";
import { apiFetch } from "@/lib/client/api";
import { Button } from "./button";

/**
 * Ends the session through DELETE /api/session, then loads the sign-in page afresh (through the
 * institution's sign-out first when the session came from there).
 */
export function SignOutButton() {
  const [busy, setBusy] = useState(false);
  return (
    <Button
      variant="secondary"
      size="sm"
      disabled={busy}
      onClick={async () => {
        setBusy(true);
        let next = "/sign-in";
        try {
          // After an institutional sign-in: the provider's sign-out address, which comes back to /sign-in.
          const result = await apiFetch<{ redirectTo?: string }>("/api/session", { method: "DELETE" });
          if (typeof result?.redirectTo === "string") next = result.redirectTo;
        } finally {
          // A full load, so no signed-in page stays in the client router's cache.
          window.location.replace(next);
        }
      }}
    >
      {busy ? "Signing out…" : "Sign out"}
    </Button>
  );
}
