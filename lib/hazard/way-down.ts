// "The way down a tier": for each criterion that set an assessment's tier, the smallest single change
// to the set-up that brings it down one tier — a lower charging voltage, a smaller capacitance, a
// narrower gap across the source, a lower current limit, more series resistance. Every suggestion is
// found and verified by re-running the engine on the changed set-up; none is computed from a formula
// of its own, so it can never disagree with the figures shown beside it.

import { assessSetup } from "./assess";
import { DEFAULT_RULES } from "./rules";
import type { Assessment, EnergySource, SetupInput, Tier, TierRules } from "./types";
import { formatQuantity } from "./units";

export type WayDownChange = {
  /** Path of the changed field, e.g. "sources[0].voltage_V" or "gaps[1].spacing_m". */
  field: string;
  /** Shown name of the source or gap changed. */
  target: string;
  /** What the field means, e.g. "charging voltage". */
  quantity: string;
  unit: string;
  from: number;
  /** The boundary value found by the engine: at it the set-up is at the lower tier. */
  to: number;
  /** "at most" (lower it to) or "at least" (raise it to). */
  direction: "at most" | "at least";
  /** to, rounded to three significant figures on the side that keeps the lower tier. */
  shown: number;
  /** Plain English: "lower the charging voltage of Bank to at most 6.32 kV". */
  text: string;
};

export type WayDownSuggestion = {
  /** The criterion that set the tier. */
  criterion: string;
  change: WayDownChange;
};

export type WayDown = { fromTier: Tier; toTier: Tier; suggestions: WayDownSuggestion[] };

type Candidate = {
  field: string;
  target: string;
  quantity: string;
  unit: string;
  from: number;
  direction: "at most" | "at least";
  /** The category of criteria it can address. */
  reaches: "stored" | "supply";
  apply: (input: SetupInput, value: number) => SetupInput;
};

const STORED = new Set([
  "stored-energy-arc",
  "stored-energy-lethal",
  "stored-energy-heavy-shock",
  "capacitance-level",
  "impulse-specific-energy",
]);
const SUPPLY = new Set([
  "arc-current-dc",
  "arc-voltage-ac",
  "fibrillation-current-dc",
  "fibrillation-current-ac",
  "let-go-current-dc",
  "let-go-current-ac",
  "touch-current-dc",
  "touch-current-ac",
]);

function withSource(input: SetupInput, index: number, patch: Record<string, number>): SetupInput {
  const sources = input.sources.map((source, i) => (i === index ? ({ ...source, ...patch } as EnergySource) : source));
  return { ...input, sources };
}

function candidates(input: SetupInput, ids: string[]): Candidate[] {
  const out: Candidate[] = [];
  input.sources.forEach((source, index) => {
    const target = ids[index];
    const add = (
      field: string,
      quantity: string,
      unit: string,
      from: number | undefined,
      direction: Candidate["direction"],
      reaches: Candidate["reaches"],
    ) => {
      if (from === undefined) return;
      out.push({
        field: `sources[${index}].${field}`,
        target,
        quantity,
        unit,
        from,
        direction,
        reaches,
        apply: (setup, value) => withSource(setup, index, { [field]: value }),
      });
    };
    switch (source.kind) {
      case "capacitor":
        add("voltage_V", "charging voltage", "V", source.voltage_V, "at most", "stored");
        add("capacitance_F", "capacitance of one unit", "F", source.capacitance_F, "at most", "stored");
        break;
      case "custom-capacitance":
        add("voltage_V", "voltage", "V", source.voltage_V, "at most", "stored");
        add("capacitance_F", "capacitance", "F", source.capacitance_F, "at most", "stored");
        break;
      case "sphere-terminal":
        add("voltage_V", "voltage", "V", source.voltage_V, "at most", "stored");
        break;
      case "dc-supply":
        add("voltage_V", "voltage", "V", source.voltage_V, "at most", "supply");
        add("currentLimit_A", "current limit", "A", source.currentLimit_A, "at most", "supply");
        add("seriesResistance_ohm", "series resistance", "Ω", source.seriesResistance_ohm ?? 0, "at least", "supply");
        add("outputCapacitance_F", "output capacitance", "F", source.outputCapacitance_F, "at most", "stored");
        break;
      case "ac-supply":
        add("voltageRms_V", "rms voltage", "V", source.voltageRms_V, "at most", "supply");
        add("currentLimit_A", "current limit", "A", source.currentLimit_A, "at most", "supply");
        break;
    }
  });
  (input.gaps ?? []).forEach((gap, index) => {
    if (!gap.across || gap.across.length === 0) return;
    out.push({
      field: `gaps[${index}].spacing_m`,
      target: gap.id ?? `gap ${index + 1}`,
      quantity: "spacing",
      unit: "m",
      from: gap.spacing_m,
      direction: "at most",
      reaches: "stored",
      apply: (setup, value) => ({
        ...setup,
        gaps: (setup.gaps ?? []).map((g, i) => (i === index ? { ...g, spacing_m: value } : g)),
      }),
    });
  });
  return out;
}

/** The tier of a changed set-up, or null when the engine refuses it (outside what it can assess). */
function tierOf(input: SetupInput, rules: TierRules): number | null {
  try {
    return assessSetup(input, rules).tier;
  } catch {
    return null;
  }
}

/** Extreme of the search: the change that goes furthest without leaving what the engine accepts. */
function extremeOf(candidate: Candidate): number {
  if (candidate.direction === "at least") return candidate.from + 1e12;
  // Gap spacings below 0.1 mm are refused by the engine, so the search stops there.
  if (candidate.unit === "m") return 1.01e-4;
  return candidate.from * 1e-9;
}

/**
 * Smallest change along one candidate that reaches the target tier, or null. The change is searched
 * as a fraction t of the way to the extreme, by bisection on the engine's own tier (monotone in each
 * of these fields), to a precision far finer than the 2 % the way-down properties check.
 */
function search(input: SetupInput, candidate: Candidate, targetTier: number, rules: TierRules): number | null {
  const extreme = extremeOf(candidate);
  if (candidate.direction === "at most" && !(extreme < candidate.from)) return null;
  const at = (t: number) => candidate.from + t * (extreme - candidate.from);
  const reaches = (t: number) => {
    const tier = tierOf(candidate.apply(input, at(t)), rules);
    return tier !== null && tier <= targetTier;
  };
  if (!reaches(1)) return null;
  let lo = 0;
  let hi = 1;
  for (let k = 0; k < 60; k++) {
    const mid = (lo + hi) / 2;
    if (reaches(mid)) hi = mid;
    else lo = mid;
  }
  return at(hi);
}

/** Three significant figures, rounded on the side that keeps the set-up at the lower tier. */
function roundSafe(value: number, direction: Candidate["direction"]): number {
  if (value === 0) return 0;
  const scale = 10 ** (Math.floor(Math.log10(Math.abs(value))) - 2);
  return direction === "at most" ? Math.floor(value / scale) * scale : Math.ceil(value / scale) * scale;
}

const relativeChange = (change: WayDownChange) =>
  Math.abs(change.to - change.from) / Math.max(Math.abs(change.from), Number.MIN_VALUE);

/**
 * For an assessment at tier ≥ 1, per criterion that set the tier, the smallest single change found
 * that brings the set-up to the tier below. Criteria no single change can lower are left out.
 */
export function wayDown(input: SetupInput, rules: TierRules = DEFAULT_RULES, assessment?: Assessment): WayDown {
  const base = assessment ?? assessSetup(input, rules);
  const fromTier = base.tier;
  if (fromTier === 0) return { fromTier, toTier: 0, suggestions: [] };
  const toTier = (fromTier - 1) as Tier;
  const ids = base.perSource.map((source) => source.id);
  const found: WayDownChange[] = [];
  const reachesOf = new Map<WayDownChange, Candidate["reaches"]>();
  for (const candidate of candidates(input, ids)) {
    const to = search(input, candidate, toTier, rules);
    if (to === null) continue;
    let shown = roundSafe(to, candidate.direction);
    // The rounded value must keep the lower tier too; if rounding lands on an invalid input, show the exact one.
    const shownTier = tierOf(candidate.apply(input, shown), rules);
    if (shownTier === null || shownTier > toTier || (candidate.direction === "at most" && shown <= 0)) shown = to;
    const verb = candidate.direction === "at most" ? "lower" : "raise";
    const change: WayDownChange = {
      field: candidate.field,
      target: candidate.target,
      quantity: candidate.quantity,
      unit: candidate.unit,
      from: candidate.from,
      to,
      direction: candidate.direction,
      shown,
      text:
        `${verb} the ${candidate.quantity} of ${candidate.target} from ${formatQuantity(candidate.from, candidate.unit)} ` +
        `to ${candidate.direction} ${formatQuantity(shown, candidate.unit)}`,
    };
    found.push(change);
    reachesOf.set(change, candidate.reaches);
  }
  const setting = base.reasons.filter(
    (reason) => reason.tier === fromTier && (STORED.has(reason.criterion) || SUPPLY.has(reason.criterion)),
  );
  const suggestions: WayDownSuggestion[] = [];
  for (const reason of setting) {
    const kind = STORED.has(reason.criterion) ? "stored" : "supply";
    const best = found
      .filter((change) => reachesOf.get(change) === kind)
      .sort((a, b) => relativeChange(a) - relativeChange(b))[0];
    if (best && !suggestions.some((s) => s.change === best))
      suggestions.push({ criterion: reason.criterion, change: best });
  }
  return { fromTier, toTier, suggestions };
}
