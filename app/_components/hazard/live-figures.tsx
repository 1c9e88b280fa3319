"use client";

import type { Assessment } from "@/lib/hazard";
import { cx } from "../cx";
import { TIER_CLASSES, tierText, type Tier } from "../tier";
import { TierBadge } from "../tier-badge";
import { headlineFigures } from "./figures";

// The figures beside the apparatus step, recomputed in the browser on every keystroke. The tier is
// announced politely when it changes; the figures are not, so a screen reader is not flooded.

type LiveFiguresProps = {
  assessment: Assessment | null;
  /** How many set-up fields do not read yet (shown instead of figures). */
  problems: number;
  className?: string;
};

export function LiveFigures({ assessment, problems, className }: LiveFiguresProps) {
  const tier = assessment?.tier as Tier | undefined;
  return (
    <section
      aria-labelledby="live-figures-heading"
      className={cx(
        "rounded-lg border bg-white px-4 py-3 shadow-xs",
        tier === undefined ? "border-stone-200" : TIER_CLASSES[tier].border,
        className,
      )}
      data-testid="live-figures"
    >
      <h2 id="live-figures-heading" className="text-sm font-semibold text-stone-900">
        Live figures
      </h2>
      <p aria-live="polite" aria-atomic="true" className="mt-2" data-testid="live-tier">
        {assessment && tier !== undefined ? (
          <>
            <TierBadge tier={tier} />
            <span className="sr-only">Live tier: {tierText(tier)}</span>
          </>
        ) : (
          <span className="text-sm text-stone-600">
            {problems > 0
              ? `No figures yet: ${problems} field${problems === 1 ? "" : "s"} to complete or correct.`
              : "Add an energy source to see its figures."}
          </span>
        )}
      </p>
      {assessment && (
        <dl className="mt-3 grid grid-cols-2 gap-x-4 gap-y-2">
          {headlineFigures(assessment).map((f) => (
            <div key={f.label} className="min-w-0">
              <dt className="text-xs text-stone-600">{f.label}</dt>
              <dd className="figure text-sm font-medium text-stone-900" data-figure={f.label}>
                {f.value}
              </dd>
            </div>
          ))}
        </dl>
      )}
      {assessment && assessment.flags.length > 0 && (
        <p className="mt-3 text-xs text-stone-700">Flags: {assessment.flags.map((f) => f.code).join(", ")}</p>
      )}
    </section>
  );
}
