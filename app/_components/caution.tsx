import { cx } from "./cx";

import { CAUTION_POINTS, CAUTION_TEXT } from "@/lib/caution";

// The standard caution on screen; the wording lives in lib/caution.ts (shared with PDFs and e-mails).
export { CAUTION_POINTS, CAUTION_TEXT };

type CautionProps = { variant?: "full" | "compact"; className?: string };

export function Caution({ variant = "full", className }: CautionProps) {
  if (variant === "compact") {
    return (
      <p className={cx("text-xs leading-5 text-stone-600", className)}>
        <span className="font-semibold text-stone-800">Caution.</span> {CAUTION_TEXT}
      </p>
    );
  }
  return (
    <div
      role="note"
      aria-label="Caution"
      className={cx(
        "flex gap-3 rounded-lg border border-l-4 border-stone-300 border-l-stone-700 bg-white px-4 py-3 text-sm leading-6 text-stone-700",
        className,
      )}
    >
      <CautionIcon />
      <div>
        <p className="font-semibold text-stone-900">Caution</p>
        <p>
          {CAUTION_POINTS[0]} {CAUTION_POINTS[1]}{" "}
          <strong className="font-semibold text-stone-900">{CAUTION_POINTS[2]}</strong>
        </p>
      </div>
    </div>
  );
}

function CautionIcon() {
  return (
    <svg viewBox="0 0 20 20" className="mt-0.5 size-5 shrink-0 text-stone-700" aria-hidden="true" focusable="false">
      <path d="M10 2.5 18 17H2L10 2.5Z" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />
      <path d="M10 8v4.25" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
      <circle cx="10" cy="14.6" r="0.9" fill="currentColor" />
    </svg>
  );
}
