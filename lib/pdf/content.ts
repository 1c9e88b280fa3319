import {
  formatQuantity,
  readableSource,
  referenceById,
  statusText,
  type Assessment,
  type EnergySource,
  type SetupInput,
  type SourceResult,
  type SparkGap,
} from "@/lib/hazard";

// The words and figures a printed permit shows, derived from the frozen set-up and assessment. Pure:
// the permit, the bench card and their tests share it. Figures use the product's format (three
// significant digits, SI prefixes) from lib/hazard.

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/** "12 Mar 2026" for an ISO calendar day (no time zone: the day is already the institution's). */
export function printDay(isoDay: string): string {
  const [y, m, d] = isoDay.split("-").map(Number);
  return `${d} ${MONTHS[m - 1]} ${y}`;
}

/** The event days: "15 Jan 2027" for one day, "15 Jan 2027 – 17 Jan 2027" for several. */
export function printDays(firstDay: string, lastDay: string): string {
  if (!firstDay) return "—";
  if (!lastDay || lastDay === firstDay) return printDay(firstDay);
  return `${printDay(firstDay)} – ${printDay(lastDay)}`;
}

/** "80 members of the public", "40 students", "no audience": the audience as a person reads it. */
export function printAudience(audienceLabel: string, audienceSize: number): string {
  if (!audienceLabel) return "—";
  if (audienceLabel === "No audience" || audienceSize <= 0) return audienceLabel;
  return `${audienceSize} ${audienceLabel.toLowerCase()}`;
}

/**
 * "2026-03-12 15:05 CET": a time printed in the institution's zone (the one its permit days are
 * counted in), the zone named as the reader's clock shows it ("GMT+2" where a zone has no common
 * abbreviation). An unknown zone prints in UTC.
 */
export function printTime(iso: string, timeZone: string): string {
  const date = new Date(iso);
  let parts: Intl.DateTimeFormatPart[];
  try {
    parts = new Intl.DateTimeFormat("en-GB", {
      timeZone,
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      hourCycle: "h23",
      timeZoneName: "short",
    }).formatToParts(date);
  } catch {
    return printTime(iso, "UTC");
  }
  const part = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? "";
  return `${part("year")}-${part("month")}-${part("day")} ${part("hour")}:${part("minute")} ${part("timeZoneName")}`;
}

/** Safe voltage of the bleeder calculation (IEC 60204-1 6.2.4, as in lib/hazard). */
export const SAFE_VOLTAGE_V = 60;
/** Default body model of the engine when the set-up gives none (worst-case hand to hand, common practice). */
export const DEFAULT_BODY_RESISTANCE_OHM = 500;

export type Figure = { label: string; value: string; note: string };

/** The figures that set the tier, with units, in the order the permit prints them. */
export function tierFigures(assessment: Assessment, setup: SetupInput): Figure[] {
  const body = setup.bodyResistance_ohm ?? DEFAULT_BODY_RESISTANCE_OHM;
  const a = assessment;
  const timeToSafe =
    a.timeToSafe_s === null
      ? { value: "no bleeder", note: `ground by hand: a source above ${SAFE_VOLTAGE_V} V has no bleeder` }
      : a.timeToSafe_s === 0
        ? { value: formatQuantity(0, "s"), note: `every source is at or below ${SAFE_VOLTAGE_V} V` }
        : { value: formatQuantity(a.timeToSafe_s, "s"), note: `bleeder time to ${SAFE_VOLTAGE_V} V, longest source` };
  const beyond = approachBeyondTable(a);
  const tables = approachSources(a);
  const withTables = (note: string) => (tables ? `${note}; ${tables}` : note);
  const distance = (value: number | null) =>
    value !== null ? formatQuantity(value, "m") : beyond ? "set by a qualified person" : "none";
  return [
    { label: "Stored energy", value: formatQuantity(a.energy_J, "J"), note: "½·C·V², all sources" },
    {
      label: "Maximum voltage",
      value: formatQuantity(a.maxVoltage_V, "V"),
      note:
        a.gapCeiling_V !== null ? `capped by a spark gap at ${formatQuantity(a.gapCeiling_V, "V")}` : "highest source",
    },
    {
      label: "Peak current",
      value: formatQuantity(a.peakCurrent_A, "A"),
      note: `through a ${formatQuantity(body, "Ω")} body`,
    },
    {
      label: "Continuous current",
      value: formatQuantity(a.continuousCurrent_A, "A"),
      note: a.continuousCurrent_A > 0 ? "from the supplies" : "no supply drives current",
    },
    { label: "Time to safe voltage", value: timeToSafe.value, note: timeToSafe.note },
    {
      label: "Limited approach",
      value: distance(a.approach.limited_m),
      note: withTables(beyond ? "beyond the published table: a qualified person sets it" : "audience outside"),
    },
    {
      label: "Restricted approach",
      value: distance(a.approach.restricted_m),
      note: beyond ? "beyond the published table" : "trained people only, insulated",
    },
    {
      label: "Stored charge",
      value: formatQuantity(a.charge_C, "C"),
      note: `${formatQuantity(a.capacitance_F, "F")} in all`,
    },
  ];
}

/** A line of the permit that states a finding, with the publication and clause it rests on. */
export type PrintedFinding = { text: string; source: string };

/**
 * The publication, edition and clause behind a reason or flag, as a reader can look it up, in the
 * permit's short form: "IEC 60204-1 (2016), 6.2.4 (protection against residual voltages) — read in
 * the text". The finding's own words already state the threshold. An assessment stored by engine 1
 * has no reference id and named an internal working file in its source text; that pointer is dropped.
 */
export function printedSource(item: { source: string; ref?: string }, brief = false): string {
  const ref = item.ref ? referenceById(item.ref) : undefined;
  if (!ref) return readableSource(item.source);
  const title = ref.title.split(/, | – /)[0];
  const edition = ref.edition ? ` (${ref.edition})` : "";
  // Brief (a figure's note): the clause's number without its description.
  const clauseText = brief ? ref.clause.split(/,| \(/)[0] : ref.clause;
  const clause = clauseText && clauseText !== "—" ? `, ${clauseText}` : "";
  return `${title}${edition}${clause} — ${statusText(ref.status)}`;
}

const isApproach = (r: Assessment["reasons"][number]) => r.criterion.startsWith("approach");

/** The reasons that put the set-up in its tier (criteria that hold at the assessed tier), with sources. */
export function decidingReasons(assessment: Assessment): PrintedFinding[] {
  return assessment.reasons
    .filter((r) => r.tier === assessment.tier && !isApproach(r) && r.criterion !== "gap-ceiling")
    .map((r) => ({ text: r.meaning, source: printedSource(r, true) }));
}

/** How the voltage ceiling was reached: each gap's reason, with its source. (The approach table's
 * source is printed in the approach figures' notes.) */
export function figureReasons(assessment: Assessment): PrintedFinding[] {
  return assessment.reasons
    .filter((r) => r.criterion === "gap-ceiling")
    .map((r) => ({ text: r.meaning, source: printedSource(r) }));
}

/** The approach tables used, briefly: "NFPA 70E (2018), Table 130.4(E)(b) — from memory". */
function approachSources(assessment: Assessment): string {
  const seen = new Set<string>();
  for (const r of assessment.reasons) if (isApproach(r)) seen.add(printedSource(r, true));
  return [...seen].join("; ");
}

/** The flags beside the tier, each with its source. */
export function printedFlags(assessment: Assessment): PrintedFinding[] {
  return assessment.flags.map((f) => ({ text: f.message, source: printedSource(f, true) }));
}

/**
 * True when a voltage lies above the last row of an approach table: the engine gives no distance
 * (null) and a qualified person sets it. Printing "none" there would read as "no boundary needed".
 */
export function approachBeyondTable(assessment: Assessment): boolean {
  return assessment.reasons.some((r) => isApproach(r) && r.value > r.threshold);
}

const KIND_LABELS: Record<EnergySource["kind"], string> = {
  capacitor: "Capacitor",
  "custom-capacitance": "Capacitance",
  "sphere-terminal": "Sphere terminal",
  "dc-supply": "DC supply",
  "ac-supply": "AC supply",
};

export type SourceLine = { label: string; kind: string; detail: string; energy: string; voltage: string };

function sourceLabel(source: EnergySource, index: number): string {
  return source.id?.trim() || `Source ${index + 1}`;
}

function describe(source: EnergySource): { kind: string; detail: string } {
  const q = formatQuantity;
  switch (source.kind) {
    case "capacitor": {
      const count = source.count ?? 1;
      const arrangement = source.arrangement ?? "parallel";
      const parts = [
        count > 1
          ? `${count} × ${q(source.capacitance_F, "F")} in ${arrangement}, at ${q(source.voltage_V, "V")}`
          : `${q(source.capacitance_F, "F")} at ${q(source.voltage_V, "V")}`,
      ];
      if (source.ratedVoltage_V !== undefined) parts.push(`rated ${q(source.ratedVoltage_V, "V")} each`);
      parts.push(source.bleeder_ohm !== undefined ? `bleeder ${q(source.bleeder_ohm, "Ω")}` : "no bleeder");
      if (source.seriesResistance_ohm) parts.push(`series ${q(source.seriesResistance_ohm, "Ω")}`);
      return { kind: count > 1 ? "Capacitor bank" : KIND_LABELS.capacitor, detail: parts.join(", ") };
    }
    case "custom-capacitance": {
      const parts = [`${q(source.capacitance_F, "F")} at ${q(source.voltage_V, "V")}`];
      parts.push(source.bleeder_ohm !== undefined ? `bleeder ${q(source.bleeder_ohm, "Ω")}` : "no bleeder");
      return { kind: KIND_LABELS[source.kind], detail: parts.join(", ") };
    }
    case "sphere-terminal":
      return {
        kind: KIND_LABELS[source.kind],
        detail:
          source.voltage_V !== undefined
            ? `radius ${q(source.radius_m, "m")}, at ${q(source.voltage_V, "V")}`
            : `radius ${q(source.radius_m, "m")}, charged until the gap breaks down`,
      };
    case "dc-supply": {
      const parts = [`${q(source.voltage_V, "V")} DC, current limit ${q(source.currentLimit_A, "A")}`];
      if (source.seriesResistance_ohm) parts.push(`series ${q(source.seriesResistance_ohm, "Ω")}`);
      if (source.outputCapacitance_F) parts.push(`output ${q(source.outputCapacitance_F, "F")}`);
      return { kind: KIND_LABELS[source.kind], detail: parts.join(", ") };
    }
    case "ac-supply":
      return {
        kind: KIND_LABELS[source.kind],
        detail: `${q(source.voltageRms_V, "V")} rms at ${q(source.frequency_Hz, "Hz")}, current limit ${q(source.currentLimit_A, "A")} rms`,
      };
  }
}

/** One line per energy source: what it is, as set up, and what it stores after gap ceilings. */
export function sourceLines(setup: SetupInput, assessment: Assessment): SourceLine[] {
  return setup.sources.map((source, index) => {
    const result: SourceResult | undefined = assessment.perSource[index];
    const { kind, detail } = describe(source);
    return {
      label: sourceLabel(source, index),
      kind,
      detail,
      energy: result && result.energy_J > 0 ? formatQuantity(result.energy_J, "J") : "—",
      voltage: result ? formatQuantity(result.voltage_V, "V") : "—",
    };
  });
}

export function gapLines(gaps: SparkGap[] | undefined): string[] {
  return (gaps ?? []).map((gap, index) => {
    const air = [
      gap.pressure_Pa !== undefined ? formatQuantity(gap.pressure_Pa, "Pa") : null,
      gap.temperature_C !== undefined ? formatQuantity(gap.temperature_C, "°C") : null,
    ].filter(Boolean);
    return `Spark gap ${index + 1}: ${formatQuantity(gap.sphereDiameter_m, "m")} spheres, ${formatQuantity(gap.spacing_m, "m")} apart${air.length ? ` (${air.join(", ")})` : ""}`;
  });
}

/**
 * The voltage a test probe must be rated for: the highest voltage anything is charged toward, as set
 * up, not the lower figure a spark gap limits it to. A gap that fails to break down (dirty spheres,
 * moved electrodes, humid air) lets a bank reach its charging voltage, so the probe must survive that
 * (common practice: rate test equipment for the highest voltage that can be present). AC as its
 * crest, √2·V_rms; a terminal with no voltage of its own counts at the gap-limited figure.
 */
export function probeRating_V(setup: SetupInput, assessment: Assessment): number {
  let highest = assessment.maxVoltage_V;
  for (const source of setup.sources) {
    const v =
      source.kind === "ac-supply"
        ? source.voltageRms_V * Math.SQRT2
        : "voltage_V" in source && typeof source.voltage_V === "number"
          ? source.voltage_V
          : 0;
    if (Number.isFinite(v) && v > highest) highest = v;
  }
  return highest;
}

const STORES_ENERGY = new Set<EnergySource["kind"]>(["capacitor", "custom-capacitance", "sphere-terminal"]);

function listNames(names: string[]): string {
  if (names.length <= 1) return names.join("");
  return `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
}

/**
 * The discharge-before-touch procedure for this set-up (common practice): isolate the supplies, let
 * the bleeders work, ground every stored-energy part with the hook, leave it grounded, check, and
 * re-ground after a pause because capacitors recover charge (dielectric absorption).
 */
export function dischargeSteps(setup: SetupInput, assessment: Assessment): string[] {
  const labelled = setup.sources.map((s, i) => ({ source: s, label: sourceLabel(s, i) }));
  const supplies = labelled.filter((s) => s.source.kind === "dc-supply" || s.source.kind === "ac-supply");
  const stores = labelled.filter(
    (s) => STORES_ENERGY.has(s.source.kind) || (s.source.kind === "dc-supply" && s.source.outputCapacitance_F),
  );
  const steps: string[] = [];
  steps.push(
    supplies.length
      ? `Switch off the ${supplies.length > 1 ? "supplies" : "supply"} (${listNames(supplies.map((s) => s.label))}), remove the key or unplug, and keep the plug in view.`
      : "Stop charging: halt the generator or disconnect whatever charges the set-up.",
  );
  if (stores.length) {
    if (assessment.timeToSafe_s !== null && assessment.timeToSafe_s > 0) {
      steps.push(
        `Wait at least ${formatQuantity(assessment.timeToSafe_s, "s")} for the bleeders to bring every part below ${SAFE_VOLTAGE_V} V.`,
      );
    } else if (assessment.timeToSafe_s === null) {
      steps.push(`Do not wait for the charge to leak away: a part above ${SAFE_VOLTAGE_V} V has no bleeder.`);
    }
    steps.push(
      `Touch the grounding hook to ${listNames(stores.map((s) => s.label))}${
        setup.gaps?.length ? " and both spheres of every spark gap" : ""
      }, terminal by terminal.`,
    );
    steps.push("Leave the hook or a shorting link on every capacitor while anyone works on the set-up.");
  }
  steps.push(
    `Check with a probe rated for ${formatQuantity(probeRating_V(setup, assessment), "V")} that nothing is above ${SAFE_VOLTAGE_V} V before touching.`,
  );
  if (stores.length) steps.push("After any pause, ground again: capacitors recover charge on their own.");
  return steps;
}
