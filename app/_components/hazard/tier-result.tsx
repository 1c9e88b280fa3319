import { useId } from "react";
import type { Assessment, SetupInput, TierRules } from "@/lib/hazard";
import { formatQuantity, readableSource, referenceAnchor } from "@/lib/hazard";
import { AboutFigures } from "../about-figures";
import { cx } from "../cx";
import { TIER_CLASSES, type Tier } from "../tier";
import { TierBadge } from "../tier-badge";
import { figureRows, type FigureRow } from "./figures";

// The full hazard result: the tier in colour and words, every figure with its formula, inputs and
// the thresholds it was compared with (each with its source) on expand, the flags, the figures per
// source, and the note about the figures. No hooks: it renders on the server (apparatus page) and in the form.

/** A source as a reader can follow it: publication and clause, linked to its References entry. */
export function SourceText({ source, refId }: { source: string; refId?: string }) {
  const text = readableSource(source);
  if (!refId) return <>{text}</>;
  return (
    <a href={`/references#${referenceAnchor(refId)}`} className="underline decoration-dotted underline-offset-2">
      {text}
    </a>
  );
}

const FLAG_TITLES: Record<string, string> = {
  thermal: "Burn hazard",
  "x-ray": "X-rays",
  ozone: "Ozone",
  ignition: "Ignition",
  overvoltage: "Over-voltage",
  "no-bleeder": "No bleeder",
  "discharge-time": "Slow discharge",
  implausible: "Check this figure",
};

type TierResultProps = {
  assessment: Assessment;
  setup: SetupInput | null;
  rules: TierRules;
  /** Heading level of the section titles inside (the page's own h1/h2 sit above). */
  headingLevel?: 2 | 3;
  className?: string;
};

export function TierResult({ assessment: a, setup, rules, headingLevel = 2, className }: TierResultProps) {
  const H = headingLevel === 2 ? "h2" : "h3";
  const tier = a.tier as Tier;
  const deciding = a.reasons.filter(
    (r) => r.tier === a.tier && !r.criterion.startsWith("approach") && r.criterion !== "gap-ceiling",
  );
  const rows = figureRows(a, setup, rules);
  const id = useId();
  return (
    <div className={cx("flex flex-col gap-5", className)}>
      <section
        aria-label="Tier"
        className={cx("rounded-lg border px-4 py-3", TIER_CLASSES[tier].tint, TIER_CLASSES[tier].border)}
        data-testid="tier-result"
      >
        <div className="flex flex-wrap items-center gap-3">
          <TierBadge tier={tier} />
          <span className={cx("text-sm font-medium", TIER_CLASSES[tier].text)}>
            Engine {a.engineVersion}, rules {a.rulesVersion}
          </span>
        </div>
        {deciding.length > 0 && (
          <ul className="mt-2 list-disc space-y-1 pl-5 text-sm text-stone-800">
            {deciding.map((r) => (
              <li key={r.criterion}>
                {r.meaning}{" "}
                <span className="text-stone-600">
                  Source: <SourceText source={r.source} refId={r.ref} />.
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby={`${id}-figures`}>
        <H id={`${id}-figures`} className="text-base font-semibold text-stone-900">
          Figures
        </H>
        <p className="mt-0.5 text-sm text-stone-600">
          Open a figure to see its formula, its inputs and the thresholds it was compared with.
        </p>
        <ul className="mt-2 divide-y divide-stone-200 rounded-lg border border-stone-200 bg-white">
          {rows.map((row) => (
            <FigureItem key={row.key} row={row} />
          ))}
        </ul>
      </section>

      {a.flags.length > 0 && (
        <section aria-labelledby={`${id}-flags`}>
          <H id={`${id}-flags`} className="text-base font-semibold text-stone-900">
            Flags
          </H>
          <ul className="mt-2 flex flex-col gap-2">
            {a.flags.map((f, i) => (
              <li
                key={`${f.code}-${i}`}
                className="rounded-md border border-amber-300 bg-amber-50 px-3 py-2 text-sm text-amber-950"
              >
                <span className="font-semibold">{FLAG_TITLES[f.code] ?? f.code}.</span> {f.message}{" "}
                <span className="text-amber-900">
                  Source: <SourceText source={f.source} refId={f.ref} />.
                </span>
              </li>
            ))}
          </ul>
        </section>
      )}

      {a.perSource.length > 1 && (
        <section aria-labelledby={`${id}-per-source`}>
          <H id={`${id}-per-source`} className="text-base font-semibold text-stone-900">
            Per source
          </H>
          <div role="group" aria-label="Figures per source" tabIndex={0} className="mt-2 overflow-x-auto">
            <table className="w-full text-left text-sm">
              <thead>
                <tr className="border-b border-stone-200 text-xs text-stone-600 uppercase">
                  <th scope="col" className="px-2 py-1.5">
                    Source
                  </th>
                  <th scope="col" className="px-2 py-1.5 text-right">
                    Voltage
                  </th>
                  <th scope="col" className="px-2 py-1.5 text-right">
                    Energy
                  </th>
                  <th scope="col" className="px-2 py-1.5 text-right">
                    Peak current
                  </th>
                  <th scope="col" className="px-2 py-1.5 text-right">
                    Tier alone
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-stone-100">
                {a.perSource.map((s, i) => (
                  <tr key={`${s.id}-${i}`}>
                    <th scope="row" className="px-2 py-1.5 font-medium">
                      {s.id}
                    </th>
                    <td className="figure px-2 py-1.5 text-right">{formatQuantity(s.voltage_V, "V")}</td>
                    <td className="figure px-2 py-1.5 text-right">{formatQuantity(s.energy_J, "J")}</td>
                    <td className="figure px-2 py-1.5 text-right">{formatQuantity(s.peakCurrent_A, "A")}</td>
                    <td className="figure px-2 py-1.5 text-right">{s.tier}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </section>
      )}

      <AboutFigures />
    </div>
  );
}

function FigureItem({ row }: { row: FigureRow }) {
  return (
    <li>
      <details className="group px-3 py-2" data-figure={row.key}>
        <summary className="flex cursor-pointer list-none items-baseline justify-between gap-3 rounded-sm">
          <span className="flex items-baseline gap-2 text-sm text-stone-800">
            <span
              aria-hidden="true"
              className="inline-block w-3 text-stone-500 transition-transform group-open:rotate-90"
            >
              ›
            </span>
            {row.label}
            {row.decides && (
              <span className="rounded bg-stone-800 px-1.5 text-xs font-medium text-white">sets the tier</span>
            )}
          </span>
          <span className="figure text-sm font-medium text-stone-900">{row.value}</span>
        </summary>
        <div className="mt-2 ml-5 flex flex-col gap-2 text-sm text-stone-700">
          <p>
            <span className="font-medium text-stone-900">Formula: </span>
            <span className="figure">{row.formula}</span>
          </p>
          {row.inputs.length > 0 && (
            <div>
              <p className="font-medium text-stone-900">Inputs</p>
              <dl className="mt-0.5 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5">
                {row.inputs.map((input, i) => (
                  <div key={`${input.name}-${i}`} className="contents">
                    <dt className="text-stone-600">{input.name}</dt>
                    <dd className="figure">{input.value}</dd>
                  </div>
                ))}
              </dl>
            </div>
          )}
          {row.comparisons.length > 0 && (
            <div>
              <p className="font-medium text-stone-900">Compared with</p>
              <ul className="mt-0.5 flex flex-col gap-1">
                {row.comparisons.map((c, i) => (
                  <li key={i}>
                    <span className={cx("font-medium", c.reached ? "text-stone-900" : "text-stone-600")}>
                      {c.reached ? "Reached: " : "Not reached: "}
                    </span>
                    {c.text}
                    {c.meaning && <span className="block text-stone-700">{c.meaning}</span>}
                    <span className="block text-xs text-stone-600">
                      Source: <SourceText source={c.source} refId={c.ref} />
                    </span>
                  </li>
                ))}
              </ul>
            </div>
          )}
        </div>
      </details>
    </li>
  );
}
