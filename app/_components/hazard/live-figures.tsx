"use client";

import { useFormContext, useWatch, type FieldValues } from "react-hook-form";
import { formFieldName, gapLabel, gapLimit, namedIssues } from "@/lib/apparatus/live";
import { formatQuantity, type TierRules } from "@/lib/hazard";
import type { SetupText } from "@/lib/apparatus/schemas";
import { cx } from "../cx";
import { TIER_CLASSES, tierText, type Tier } from "../tier";
import { TierBadge } from "../tier-badge";
import { headlineFigures } from "./figures";
import type { LiveAssessment } from "./use-live-assessment";

// The figures beside the set-up, recomputed in the browser on every keystroke, with their why: which
// gap holds the voltage down, and which fields are still to complete (each a link to its field). The
// tier is announced politely when it changes; the figures are not, so a screen reader is not flooded.
// Used inside a react-hook-form FormProvider whose set-up text sits at `prefix`.

type LiveFiguresProps = {
  live: LiveAssessment;
  /** Where the set-up text sits in the form ("setup", "apparatus.setup"). */
  prefix: string;
  rules: TierRules;
  className?: string;
};

export function LiveFigures({ live, prefix, rules, className }: LiveFiguresProps) {
  const { control, setFocus } = useFormContext<FieldValues>();
  const text = useWatch({ control, name: prefix }) as Partial<SetupText> | undefined;
  const { assessment, omittedGaps } = live;
  const tier = assessment?.tier as Tier | undefined;
  const problems = namedIssues(live.issues, text);
  const limit = gapLimit(live.setup, assessment, rules);
  // Gap numbers as the form shows them: the figures' set-up may lack the gaps being filled in.
  const keptGaps = (text?.gaps ?? []).map((_, i) => i).filter((i) => !omittedGaps.includes(i));
  const limitingGap = limit ? (keptGaps[limit.gapIndex] ?? limit.gapIndex) : null;

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
        ) : live.pending ? (
          // The application form fetches the engine when first needed; this is said, not guessed.
          <span className="text-sm text-stone-600" data-testid="live-pending">
            Loading the hazard calculation…
          </span>
        ) : (
          <span className="text-sm text-stone-600">
            {problems.length > 0 ? "No figures yet." : "Add an energy source to see its figures."}
          </span>
        )}
      </p>
      {assessment && omittedGaps.length > 0 && (
        <p className="mt-2 text-xs text-stone-700" data-testid="live-omitted">
          Shown without {omittedGaps.map((i) => `spark gap ${i + 1} (${gapLabel(i)})`).join(" and ")} until{" "}
          {omittedGaps.length === 1 ? "its" : "their"} fields are complete: without a gap the voltage is not held down,
          so these figures overstate the hazard.
        </p>
      )}
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
      {limit && limitingGap !== null && (
        <p className="mt-2 text-xs text-stone-800" data-testid="live-gap-limit">
          Limited by gap {gapLabel(limitingGap)} to{" "}
          <span className="figure font-medium">{formatQuantity(limit.ceiling_V, "V")}</span>: the source is set to{" "}
          <span className="figure">{formatQuantity(limit.requested_V, "V")}</span>, and the gap sparks over first.
        </p>
      )}
      {problems.length > 0 && (
        <div className="mt-3" data-testid="live-problems">
          <p className="text-sm text-stone-800">
            {problems.length} field{problems.length === 1 ? "" : "s"} to complete or correct:
          </p>
          <ul className="mt-1 flex flex-col gap-1 text-sm">
            {problems.map((p) => (
              <li key={p.path.join(".")}>
                <a
                  href={`#${p.path.join("-")}`}
                  className="text-ink-700 underline"
                  onClick={(event) => {
                    event.preventDefault();
                    if (p.path.length > 0) setFocus(formFieldName(prefix, p.path));
                  }}
                >
                  {p.label}
                </a>
                <span className="block text-xs text-stone-600">{p.message}</span>
              </li>
            ))}
          </ul>
        </div>
      )}
      {assessment && assessment.flags.length > 0 && (
        <p className="mt-3 text-xs text-stone-700">Flags: {assessment.flags.map((f) => f.code).join(", ")}</p>
      )}
    </section>
  );
}
