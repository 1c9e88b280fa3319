"use client";

import { fontVariables } from "./fonts";
import "./globals.css";

// Replaces the root layout when it fails, so it brings its own <html> and <body>. Kept free of
// other components: whatever broke the layout may be among them.
export default function GlobalError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <html lang="en-GB" className={fontVariables}>
      <body>
        <main className="flex min-h-dvh items-center justify-center px-4 py-12">
          <div className="w-full max-w-md">
            <p className="text-sm font-medium text-stone-600">Benchclear</p>
            <h1 className="mt-1 text-2xl font-semibold tracking-tight text-stone-900">Benchclear is unavailable</h1>
            <p className="mt-2 text-stone-700">
              The application could not start this page. Try again; if it keeps failing, tell your administrator.
            </p>
            {error.digest && (
              <p className="mt-2 text-sm text-stone-600">
                Reference: <span className="figure text-stone-900">{error.digest}</span>
              </p>
            )}
            <button
              type="button"
              onClick={() => reset()}
              className="mt-6 inline-flex h-10 items-center rounded-md bg-ink-700 px-3.5 text-sm font-medium text-white hover:bg-ink-800"
            >
              Try again
            </button>
          </div>
        </main>
      </body>
    </html>
  );
}
