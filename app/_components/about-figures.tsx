import { ABOUT_FIGURES_POINTS, ABOUT_FIGURES_TEXT, ABOUT_FIGURES_TITLE, INFO_SYMBOL } from "@/lib/about-figures";
import { cx } from "./cx";

// The note "About these figures" on every result screen, permit and page frame; the wording and the
// information symbol live in lib/about-figures.ts (shared with PDFs and e-mails). It is styled as a
// note in the interface's ink, never as a hazard sign: no signal word, no warning colours.

export { ABOUT_FIGURES_POINTS, ABOUT_FIGURES_TEXT, ABOUT_FIGURES_TITLE };

type AboutFiguresProps = { variant?: "full" | "compact"; className?: string };

export function AboutFigures({ variant = "full", className }: AboutFiguresProps) {
  if (variant === "compact") {
    return (
      <p className={cx("flex gap-1.5 text-xs leading-5 text-stone-600", className)}>
        <InfoSymbol className="mt-0.5 size-4" />
        <span>
          <span className="font-semibold text-stone-800">{ABOUT_FIGURES_TITLE}:</span> {ABOUT_FIGURES_TEXT}
        </span>
      </p>
    );
  }
  return (
    <div
      role="note"
      aria-label={ABOUT_FIGURES_TITLE}
      className={cx(
        "flex gap-3 rounded-lg border border-l-4 border-stone-300 border-l-ink-600 bg-white px-4 py-3 text-sm leading-6 text-stone-700",
        className,
      )}
    >
      <InfoSymbol className="mt-0.5 size-5" />
      <div>
        <p className="font-semibold text-stone-900">{ABOUT_FIGURES_TITLE}</p>
        <p>
          {ABOUT_FIGURES_POINTS[0]} {ABOUT_FIGURES_POINTS[1]}{" "}
          <strong className="font-semibold text-stone-900">{ABOUT_FIGURES_POINTS[2]}</strong>
        </p>
      </div>
    </div>
  );
}

function InfoSymbol({ className }: { className?: string }) {
  return (
    <svg
      viewBox={INFO_SYMBOL.viewBox}
      className={cx("shrink-0 text-ink-600", className)}
      aria-hidden="true"
      focusable="false"
    >
      <path d={INFO_SYMBOL.ring} fill="none" stroke="currentColor" strokeWidth={INFO_SYMBOL.stroke} />
      <path
        d={INFO_SYMBOL.stem}
        fill="none"
        stroke="currentColor"
        strokeWidth={INFO_SYMBOL.stroke * 1.2}
        strokeLinecap="round"
      />
      <path d={INFO_SYMBOL.dot} fill="currentColor" />
    </svg>
  );
}
