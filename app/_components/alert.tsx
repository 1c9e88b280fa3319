import type { ReactNode } from "react";
import { cx } from "./cx";

export type AlertTone = "info" | "warn" | "error" | "success";

type AlertProps = {
  tone?: AlertTone;
  title?: ReactNode;
  children?: ReactNode;
  /**
   * Announce the alert when it appears (role="alert" for errors, role="status" otherwise). Leave
   * off for notes that are part of the page from the start.
   */
  live?: boolean;
  className?: string;
};

const tones: Record<AlertTone, { box: string; icon: string; word: string }> = {
  info: { box: "border-ink-200 bg-ink-50 text-ink-900", icon: "text-ink-700", word: "Note" },
  // Not "Warning": the signal words DANGER, WARNING and CAUTION are kept for hazard headers (ANSI Z535.4).
  warn: { box: "border-amber-300 bg-amber-50 text-amber-950", icon: "text-amber-800", word: "Attention" },
  error: { box: "border-red-300 bg-red-50 text-red-950", icon: "text-red-800", word: "Error" },
  success: { box: "border-emerald-300 bg-emerald-50 text-emerald-950", icon: "text-emerald-800", word: "Done" },
};

export function Alert({ tone = "info", title, children, live = false, className }: AlertProps) {
  const t = tones[tone];
  const role = live ? (tone === "error" ? "alert" : "status") : undefined;
  return (
    <div role={role} className={cx("flex gap-3 rounded-lg border px-4 py-3 text-sm leading-6", t.box, className)}>
      <AlertIcon tone={tone} className={cx("mt-0.5 size-5 shrink-0", t.icon)} />
      <div className="min-w-0">
        {/* The tone in words, for anyone who cannot tell the colours apart. */}
        <p className="font-semibold">
          {title ?? t.word}
          {title && <span className="sr-only"> ({t.word.toLowerCase()})</span>}
        </p>
        {children && <div className="mt-0.5">{children}</div>}
      </div>
    </div>
  );
}

function AlertIcon({ tone, className }: { tone: AlertTone; className: string }) {
  return (
    <svg viewBox="0 0 20 20" className={className} aria-hidden="true" focusable="false">
      {tone === "warn" ? (
        <path d="M10 2.5 18 17H2L10 2.5Z" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />
      ) : tone === "error" ? (
        <path
          d="M6.9 2.5h6.2l4.4 4.4v6.2l-4.4 4.4H6.9l-4.4-4.4V6.9l4.4-4.4Z"
          fill="none"
          stroke="currentColor"
          strokeWidth="1.5"
          strokeLinejoin="round"
        />
      ) : (
        <circle cx="10" cy="10" r="7.5" fill="none" stroke="currentColor" strokeWidth="1.5" />
      )}
      {tone === "success" ? (
        <path
          d="m6.5 10.2 2.3 2.3 4.7-4.8"
          fill="none"
          stroke="currentColor"
          strokeWidth="1.6"
          strokeLinecap="round"
          strokeLinejoin="round"
        />
      ) : tone === "info" ? (
        <>
          <path d="M10 9v4.5" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
          <circle cx="10" cy="6.4" r="0.95" fill="currentColor" />
        </>
      ) : (
        <>
          <path
            d={tone === "warn" ? "M10 8v4.25" : "M10 6.25v4.5"}
            stroke="currentColor"
            strokeWidth="1.6"
            strokeLinecap="round"
          />
          <circle cx="10" cy={tone === "warn" ? 14.6 : 13.6} r="0.95" fill="currentColor" />
        </>
      )}
    </svg>
  );
}
