"use client";

import { useState } from "react";
import { apiFetch } from "@/lib/client/api";
import { Button } from "./button";

/** Ends the session through DELETE /api/session, then loads the sign-in page afresh. */
export function SignOutButton() {
  const [busy, setBusy] = useState(false);
  return (
    <Button
      variant="secondary"
      size="sm"
      disabled={busy}
      onClick={async () => {
        setBusy(true);
        try {
          await apiFetch("/api/session", { method: "DELETE" });
        } finally {
          // A full load, so no signed-in page stays in the client router's cache.
          window.location.replace("/sign-in");
        }
      }}
    >
      {busy ? "Signing out…" : "Sign out"}
    </Button>
  );
}
