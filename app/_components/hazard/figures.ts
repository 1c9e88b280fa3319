// Every figure of an assessment as a reader needs it on expand: its value, the formula, the inputs it
// was computed from, and what it was compared with — the thresholds of the tier rules with their
// sources, marked reached or not. Pure, so the form's live panel and the server pages agree.

import {
  formatQuantity,
  TIER_LABELS,
  type Assessment,
  type Reason,
  type SetupInput,
  type Tier,
  type TierRules,
} from "@/lib/hazard";

export type Comparison = {
  /** "≥ 250 mJ → tier 2 (Reflex injury)" */
  text: string;
  source: string;
  /** Entry on the References page, when known. */
  ref?: string;
  reached: boolean;
  /** The engine's own sentence when the criterion holds. */
  meaning?: string;
};

export type FigureRow = {
  key: string;
  label: string;
  value: string;
  formula: string;
  inputs: { name: string; value: string }[];
  comparisons: Comparison[];
  /** A reached comparison set the tier. */
  decides: boolean;
};

const q = formatQuantity;

function worstSource(a: Assessment) {
  return a.perSource.reduce((w, s) => (s.peakCurrent_A > w.peakCurrent_A ? s : w), a.perSource[0]);
}

function held(a: Assessment, criterion: string): Reason | undefined {
  return a.reasons.find((r) => r.criterion === criterion);
}

function compare(a: Assessment, criterion: string, text: string, source: string, fallbackReached = false): Comparison {
  const reason = held(a, criterion);
  // Touch-current and capacitance-level reasons are listed at tier 0 too (within the level).
  const reached = reason ? reason.tier > 0 || fallbackReached : fallbackReached;
  return { text, source: reason?.source ?? source, ref: reason?.ref, reached, meaning: reason?.meaning };
}

const tierName = (tier: number) => `tier ${tier} (${TIER_LABELS[tier as Tier]})`;

export function figureRows(a: Assessment, setup: SetupInput | null, rules: TierRules): FigureRow[] {
  const body = setup?.bodyResistance_ohm ?? rules.bodyResistance.value;
  const worst = worstSource(a);
  const rows: FigureRow[] = [];
  const ts = rules.touchSafe;

  rows.push({
    key: "maxVoltage",
    label: "Highest voltage",
    value: q(a.maxVoltage_V, "V"),
    formula: "V = min(V_source, V_gap); an AC supply counts at its crest, √2·V_rms",
    inputs: [
      ...a.perSource.map((s) => ({ name: `${s.id} (after any gap)`, value: q(s.voltage_V, "V") })),
      ...(a.gapCeiling_V !== null ? [{ name: "Lowest gap breakdown", value: q(a.gapCeiling_V, "V") }] : []),
    ],
    comparisons: [
      {
        text: `≤ ${q(ts.dcVoltage.value, "V")} DC or ≤ ${q(ts.acVoltageRms.value, "V")} rms is touch-safe whatever is stored`,
        source: ts.dcVoltage.source,
        ref: ts.dcVoltage.ref,
        reached: a.maxVoltage_V <= ts.dcVoltage.value,
        meaning: (held(a, "touch-safe-voltage-dc") ?? held(a, "touch-safe-voltage-ac"))?.meaning,
      },
    ],
    decides: false,
  });

  if (a.gapCeiling_V !== null) {
    const gap = held(a, "gap-ceiling");
    rows.push({
      key: "gapCeiling",
      label: "Gap ceiling",
      value: q(a.gapCeiling_V, "V"),
      formula:
        "Sphere-gap table, interpolated; outside it V(kV) = 24.22·x + 6.08·√x with x = δ·d (d in cm), δ = (p / 101.325 kPa)·(293.15 K / T)",
      inputs: (setup?.gaps ?? []).map((g, i) => ({
        name: `Gap ${i + 1}`,
        value: `${q(g.sphereDiameter_m, "m")} spheres, ${q(g.spacing_m, "m")} apart`,
      })),
      comparisons: gap
        ? [
            {
              text: "Lowest breakdown of the gaps",
              source: gap.source,
              ref: gap.ref,
              reached: true,
              meaning: gap.meaning,
            },
          ]
        : [],
      decides: false,
    });
  }

  const capLevel = held(a, "capacitance-level");
  rows.push({
    key: "capacitance",
    label: "Stored-energy capacitance",
    value: q(a.capacitance_F, "F"),
    formula: "C = Σ C_i; a bank is n·C₁ in parallel or C₁/n in series; a sphere terminal is 4·π·ε₀·r",
    inputs: a.perSource.filter((s) => s.capacitance_F > 0).map((s) => ({ name: s.id, value: q(s.capacitance_F, "F") })),
    comparisons: [
      compare(
        a,
        "capacitance-level",
        `Touch-safe levels: ≤ ${q(ts.capacitance.value, "F")} up to ${q(ts.capacitanceBandTop.value, "V")}, ≤ ${q(ts.charge.value, "C")} up to ${q(ts.chargeBandTop.value, "V")}, ≤ ${q(ts.energy.value, "J")} above; beyond them ${tierName(1)}`,
        ts.capacitance.source,
      ),
    ],
    decides: capLevel !== undefined && capLevel.tier === a.tier && a.tier > 0,
  });

  rows.push({
    key: "charge",
    label: "Stored charge",
    value: q(a.charge_C, "C"),
    formula: "Q = C·V, summed over sources",
    inputs: a.perSource
      .filter((s) => s.capacitance_F > 0)
      .map((s) => ({
        name: s.id,
        value: `${q(s.capacitance_F, "F")} × ${q(s.voltage_V, "V")} = ${q(s.charge_C, "C")}`,
      })),
    comparisons: [],
    decides: false,
  });

  const energyCriteria = [
    { criterion: "stored-energy-heavy-shock", threshold: rules.reflex.energy, tier: 2, extra: "" },
    {
      criterion: "stored-energy-lethal",
      threshold: rules.lethal.energy,
      tier: 3,
      extra: ` at ≥ ${q(rules.lethal.energyMinVoltage.value, "V")}`,
    },
    {
      criterion: "stored-energy-arc",
      threshold: rules.arc.energy,
      tier: 4,
      extra: ` at ≥ ${q(rules.arc.energyMinVoltage.value, "V")}`,
    },
  ];
  rows.push({
    key: "energy",
    label: "Stored energy",
    value: q(a.energy_J, "J"),
    formula: "E = ½·C·V², summed over sources",
    inputs: a.perSource
      .filter((s) => s.capacitance_F > 0)
      .map((s) => ({
        name: s.id,
        value: `½ × ${q(s.capacitance_F, "F")} × (${q(s.voltage_V, "V")})² = ${q(s.energy_J, "J")}`,
      })),
    comparisons: energyCriteria.map((c) =>
      compare(a, c.criterion, `≥ ${q(c.threshold.value, "J")}${c.extra} → ${tierName(c.tier)}`, c.threshold.source),
    ),
    decides: energyCriteria.some((c) => c.tier === a.tier && held(a, c.criterion)),
  });

  // The worst source's series resistance adds to the body's (perSource keeps the input's order).
  const worstInput = worst && setup ? setup.sources[a.perSource.indexOf(worst)] : undefined;
  const series = worstInput && "seriesResistance_ohm" in worstInput ? (worstInput.seriesResistance_ohm ?? 0) : 0;
  const resistance = body + series;
  rows.push({
    key: "peakCurrent",
    label: "Peak body current",
    value: q(a.peakCurrent_A, "A"),
    formula: "I = V / (R_body + R_series), for the worst source",
    inputs: worst
      ? [
          { name: "Worst source", value: worst.id },
          { name: "V", value: q(worst.voltage_V, "V") },
          { name: "R_body", value: q(body, "Ω") },
          { name: "R_body + R_series", value: q(resistance, "Ω") },
        ]
      : [],
    comparisons: [],
    decides: false,
  });

  rows.push({
    key: "timeConstant",
    label: "Discharge time constant",
    value: q(a.timeConstant_s, "s"),
    formula: "τ = (R_body + R_series)·C, for the worst source",
    inputs: worst
      ? [
          { name: "C", value: q(worst.capacitance_F, "F") },
          { name: "R", value: q(resistance, "Ω") },
        ]
      : [],
    comparisons: [],
    decides: false,
  });

  rows.push({
    key: "specificEnergy",
    label: "Specific energy into the body",
    value: q(a.specificEnergy_A2s, "A²s"),
    formula: "∫i²dt = V²·C / (2·R), for the worst source",
    inputs: worst
      ? [
          { name: "V", value: q(worst.voltage_V, "V") },
          { name: "C", value: q(worst.capacitance_F, "F") },
          { name: "R", value: q(resistance, "Ω") },
        ]
      : [],
    comparisons: [],
    decides: false,
  });

  const supplies = a.perSource.filter((s) => s.kind === "dc-supply" || s.kind === "ac-supply");
  if (supplies.length > 0) {
    const dc = supplies.some((s) => s.kind === "dc-supply");
    const ac = supplies.some((s) => s.kind === "ac-supply");
    const currentCriteria = [
      ...(dc
        ? [
            {
              criterion: "touch-current-dc",
              text: `> ${q(ts.dcCurrent.value, "A")} DC → ${tierName(1)}`,
              source: ts.dcCurrent.source,
              ref: ts.dcCurrent.ref,
              tier: 1,
            },
            {
              criterion: "let-go-current-dc",
              text: `≥ ${q(rules.reflex.dcCurrent.value, "A")} DC → ${tierName(2)}`,
              source: rules.reflex.dcCurrent.source,
              ref: rules.reflex.dcCurrent.ref,
              tier: 2,
            },
            {
              criterion: "fibrillation-current-dc",
              text: `≥ ${q(rules.lethal.dcCurrent.value, "A")} DC at ≥ ${q(rules.lethal.dcMinVoltage.value, "V")} → ${tierName(3)}`,
              source: rules.lethal.dcCurrent.source,
              ref: rules.lethal.dcCurrent.ref,
              tier: 3,
            },
            {
              criterion: "arc-current-dc",
              text: `current limit ≥ ${q(rules.arc.dcCurrentLimit.value, "A")} at ≥ ${q(rules.arc.dcMinVoltage.value, "V")} → ${tierName(4)}`,
              source: rules.arc.dcCurrentLimit.source,
              ref: rules.arc.dcCurrentLimit.ref,
              tier: 4,
            },
          ]
        : []),
      ...(ac
        ? [
            {
              criterion: "touch-current-ac",
              text: `> ${q(ts.acCurrentRms.value, "A")} rms → ${tierName(1)}`,
              source: ts.acCurrentRms.source,
              ref: ts.acCurrentRms.ref,
              tier: 1,
            },
            {
              criterion: "let-go-current-ac",
              text: `≥ ${q(rules.reflex.acCurrentRms.value, "A")} rms → ${tierName(2)}`,
              source: rules.reflex.acCurrentRms.source,
              ref: rules.reflex.acCurrentRms.ref,
              tier: 2,
            },
            {
              criterion: "fibrillation-current-ac",
              text: `≥ ${q(rules.lethal.acCurrentRms.value, "A")} rms at ≥ ${q(rules.lethal.acMinVoltageRms.value, "V")} rms → ${tierName(3)}`,
              source: rules.lethal.acCurrentRms.source,
              ref: rules.lethal.acCurrentRms.ref,
              tier: 3,
            },
          ]
        : []),
    ];
    rows.push({
      key: "continuousCurrent",
      label: "Continuous body current",
      value: q(a.continuousCurrent_A, "A"),
      formula: "I = min(I_limit, V / (R_body + R_series)); AC in rms",
      inputs: supplies.map((s) => ({ name: s.id, value: q(s.continuousCurrent_A, "A") })),
      comparisons: currentCriteria.map((c) => compare(a, c.criterion, c.text, c.source)),
      decides: currentCriteria.some((c) => c.tier === a.tier && held(a, c.criterion)?.tier === c.tier),
    });
  }

  rows.push({
    key: "timeToSafe",
    label: "Time to a safe voltage",
    value: a.timeToSafe_s === null ? "unknown (no bleeder)" : q(a.timeToSafe_s, "s"),
    formula: `t = R_b·C·ln(V / ${q(rules.safeVoltage.value, "V")}), the longest over sources`,
    inputs: [],
    comparisons: [
      {
        text: `Safe at or below ${q(rules.safeVoltage.value, "V")}`,
        source: rules.safeVoltage.source,
        ref: rules.safeVoltage.ref,
        reached: a.timeToSafe_s === 0,
      },
    ],
    decides: false,
  });

  const approach = a.reasons.filter((r) => r.criterion.startsWith("approach-distance"));
  rows.push({
    key: "approach",
    label: "Approach distances",
    value:
      a.approach.limited_m === null && a.approach.restricted_m === null
        ? // Above the last row of a table there is no published distance: never read that as "none".
          approach.some((r) => r.value > r.threshold)
          ? "beyond the published table: a qualified person sets them"
          : "none listed"
        : `limited ${a.approach.limited_m === null ? "—" : q(a.approach.limited_m, "m")}, restricted ${a.approach.restricted_m === null ? "—" : q(a.approach.restricted_m, "m")}`,
    formula: "NFPA 70E approach-boundary tables, at the highest DC and AC voltages",
    inputs: [{ name: "Highest voltage", value: q(a.maxVoltage_V, "V") }],
    comparisons: approach.map((r) => ({ text: r.meaning, source: r.source, reached: true })),
    decides: false,
  });

  return rows;
}

/** The short list the live panel shows while typing. */
export function headlineFigures(a: Assessment): { label: string; value: string }[] {
  return [
    { label: "Energy", value: q(a.energy_J, "J") },
    { label: "Highest voltage", value: q(a.maxVoltage_V, "V") },
    { label: "Charge", value: q(a.charge_C, "C") },
    { label: "Peak current", value: q(a.peakCurrent_A, "A") },
    ...(a.continuousCurrent_A > 0 ? [{ label: "Continuous current", value: q(a.continuousCurrent_A, "A") }] : []),
    {
      label: "Time to safe",
      value: a.timeToSafe_s === null ? "no bleeder" : q(a.timeToSafe_s, "s"),
    },
  ];
}
