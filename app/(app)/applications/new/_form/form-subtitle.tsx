"use client";

import { useEffect, useSyncExternalStore } from "react";

// The page header's line under the title says what state the application is in. The header is rendered
// on the server before the form is used; once the form submits, this line follows it (the header kept
// saying "draft" after submitting). One application form per page, so one module-level value.

export type SubmittedSummary = { seq: number | null; revision: number; state: string };

let submitted: SubmittedSummary | null = null;
const listeners = new Set<() => void>();

export function announceSubmitted(summary: SubmittedSummary | null) {
  submitted = summary;
  for (const listener of listeners) listener();
}

function subscribe(listener: () => void) {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** The header's subtitle: `draftText` while the form is open, the submitted state once it is sent. */
export function FormSubtitle({ draftText }: { draftText: string }) {
  const current = useSyncExternalStore(
    subscribe,
    () => submitted,
    () => null,
  );
  // A new visit to the page (client navigation keeps this module) starts unsubmitted.
  useEffect(() => () => announceSubmitted(null), []);
  if (!current) return <span data-testid="form-subtitle">{draftText}</span>;
  const number = current.seq !== null ? `A-${current.seq}, ` : "";
  return (
    <span data-testid="form-subtitle">
      {current.state === "approved"
        ? `${number}revision ${current.revision}: submitted and self-certified; no review needed at its tier.`
        : `${number}revision ${current.revision}: submitted for review. It can no longer be edited.`}
    </span>
  );
}
