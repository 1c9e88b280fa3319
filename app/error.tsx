"use client";

import { useEffect } from "react";
import { buttonClasses } from "./_components/button-classes";
import { StatusPage } from "./_components/status-page";

// Errors below the root layout land here. The message and stack stay in the server log; the page
// shows only the reference (digest) so a report can be matched to the log.
export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    console.error(error);
  }, [error]);

  return (
    <StatusPage
      title="Something went wrong"
      actions={
        <>
          {/* A plain button and link (no next/link): this boundary's code loads on every page. */}
          <button type="button" className={buttonClasses()} onClick={() => reset()}>
            Try again
          </button>
          {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- a full load on purpose: no client code here */}
          <a href="/" className={buttonClasses({ variant: "secondary" })}>
            Go to the dashboard
          </a>
        </>
      }
    >
      <p>Benchclear could not show this page. Try again in a moment; if it keeps failing, go back to the dashboard.</p>
      {error.digest && (
        <p className="text-sm text-stone-600">
          If it happens again, tell your administrator this reference:{" "}
          <span className="figure rounded bg-stone-100 px-1.5 py-0.5 text-stone-900">{error.digest}</span>
        </p>
      )}
    </StatusPage>
  );
}
