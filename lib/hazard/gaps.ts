// The voltage at which a sphere gap sparks over: the ceiling no part of the set-up can charge past.
// Inside the published sphere-gap table (hazard-references §4c) the table is interpolated; elsewhere
// the empirical uniform-field law for air (§4b) is used. Both are corrected for air density.

import { HazardInputError } from "./errors";
import { formatQuantity } from "./units";
import type { SparkGap } from "./types";

/** One standard atmosphere, Pa; also 760 mmHg, the table's pressure. */
export const STANDARD_PRESSURE_PA = 101325;
/** The air-density formula's reference temperature, °C (293.15 K). */
export const REFERENCE_TEMPERATURE_C = 20;
/** 0 °C on the absolute scale, K. */
const ZERO_CELSIUS_K = 273.15;

export const DEFAULT_GAP_PRESSURE_PA = STANDARD_PRESSURE_PA;
export const DEFAULT_GAP_TEMPERATURE_C = 20;

/** Longest spacing either method is trusted for, m (100 cm): beyond it long-gap breakdown falls well
 * below both (about 6 kV/cm at several metres, hazard-references §4a). */
export const MAX_GAP_SPACING_M = 1;
/** Smallest δ·d for the uniform-field law, cm (0.1 mm in sea-level air): below it the law falls under
 * the measured minimum sparking voltage of air (about 327 V), so it would understate the ceiling. */
export const MIN_REDUCED_SPACING_CM = 0.01;

export const SPHERE_GAP_SOURCE =
  "AIEE sphere-gap table, air at 760 mmHg and 25 °C, ±3 % (hazard-references §4c); density correction k = δ (IEC 60052, memory)";
export const UNIFORM_FIELD_SOURCE =
  "empirical uniform-field law for air, V = 24.22·x + 6.08·√x kV, x = δ·d in cm (hazard-references §4b)";

/**
 * Sparkover voltages of sphere gaps (peak kV) against spacing (cm), one column per sphere diameter;
 * air at 760 mmHg and 25 °C. Columns stop where the source gives no value.
 */
export const SPHERE_GAP_TABLE = {
  pressure_Pa: STANDARD_PRESSURE_PA,
  temperature_C: 25,
  peak_kV: [10, 20, 30, 50, 100, 200],
  columns: [
    { diameter_cm: 2.5, gap_cm: [0.27, 0.58, 0.95, 2.0] },
    { diameter_cm: 5, gap_cm: [0.29, 0.6, 0.94, 1.71, 4.77] },
    { diameter_cm: 10, gap_cm: [0.3, 0.62, 0.95, 1.65, 3.75, 11.1] },
    { diameter_cm: 25, gap_cm: [0.32, 0.64, 0.98, 1.66, 3.49, 7.76] },
  ],
} as const;

type Column = (typeof SPHERE_GAP_TABLE.columns)[number];

/** Relative air density δ = (p / 101325 Pa)·(293.15 K / (273.15 + T)); 1 at 101325 Pa and 20 °C. */
export function relativeAirDensity(pressure_Pa: number, temperature_C: number): number {
  return (
    (pressure_Pa / STANDARD_PRESSURE_PA) *
    ((ZERO_CELSIUS_K + REFERENCE_TEMPERATURE_C) / (ZERO_CELSIUS_K + temperature_C))
  );
}

/** δ of the table's own air (760 mmHg, 25 °C), about 0.983. */
export const TABLE_AIR_DENSITY = relativeAirDensity(SPHERE_GAP_TABLE.pressure_Pa, SPHERE_GAP_TABLE.temperature_C);

/** Uniform-field breakdown of air in kV for a reduced spacing x = δ·d in cm. */
export function uniformFieldBreakdown_kV(reducedSpacing_cm: number): number {
  return 24.22 * reducedSpacing_cm + 6.08 * Math.sqrt(reducedSpacing_cm);
}

/** Relative tolerance for matching a diameter or spacing to a table entry (metres × 100 is inexact). */
const MATCH = 1e-9;

type ColumnReading = { kV: number; rows: string };

function rowName(column: Column, index: number): string {
  return `the ${SPHERE_GAP_TABLE.peak_kV[index]} kV row (${column.gap_cm[index]} cm)`;
}

/** Peak kV at table air for a spacing inside one column, linear in spacing between rows. */
function readColumn(column: Column, spacing_cm: number): ColumnReading | null {
  const gaps = column.gap_cm;
  const first = gaps[0];
  const last = gaps[gaps.length - 1];
  if (spacing_cm < first * (1 - MATCH) || spacing_cm > last * (1 + MATCH)) return null;
  for (let i = 0; i < gaps.length; i++) {
    if (Math.abs(spacing_cm - gaps[i]) <= gaps[i] * MATCH) {
      return { kV: SPHERE_GAP_TABLE.peak_kV[i], rows: rowName(column, i) };
    }
  }
  for (let i = 0; i < gaps.length - 1; i++) {
    if (spacing_cm > gaps[i] && spacing_cm < gaps[i + 1]) {
      const fraction = (spacing_cm - gaps[i]) / (gaps[i + 1] - gaps[i]);
      const kV =
        SPHERE_GAP_TABLE.peak_kV[i] + fraction * (SPHERE_GAP_TABLE.peak_kV[i + 1] - SPHERE_GAP_TABLE.peak_kV[i]);
      return { kV, rows: `between ${rowName(column, i)} and ${rowName(column, i + 1)}` };
    }
  }
  return null;
}

type TableReading = { kV: number; detail: string };

function readTable(diameter_cm: number, spacing_cm: number): TableReading | null {
  const columns = SPHERE_GAP_TABLE.columns;
  for (const column of columns) {
    if (Math.abs(diameter_cm - column.diameter_cm) <= column.diameter_cm * MATCH) {
      const reading = readColumn(column, spacing_cm);
      return reading && { kV: reading.kV, detail: `${column.diameter_cm} cm column, ${reading.rows}` };
    }
  }
  for (let i = 0; i < columns.length - 1; i++) {
    const low = columns[i];
    const high = columns[i + 1];
    if (diameter_cm > low.diameter_cm && diameter_cm < high.diameter_cm) {
      const a = readColumn(low, spacing_cm);
      const b = readColumn(high, spacing_cm);
      if (!a || !b) return null;
      // The columns are spaced roughly by factors of two, so the diameter is interpolated on a log scale.
      const fraction = Math.log(diameter_cm / low.diameter_cm) / Math.log(high.diameter_cm / low.diameter_cm);
      const kV = a.kV + fraction * (b.kV - a.kV);
      return {
        kV,
        detail:
          `${low.diameter_cm} cm column (${a.rows}: ${a.kV.toFixed(1)} kV) and ${high.diameter_cm} cm column ` +
          `(${b.rows}: ${b.kV.toFixed(1)} kV), interpolated on log(diameter)`,
      };
    }
  }
  return null;
}

export type GapMethod = "sphere-gap table" | "uniform-field law";

export type GapBreakdown = {
  breakdown_V: number;
  method: GapMethod;
  /** Relative air density of the gap's air. */
  delta: number;
  /** Plain-English account: method, table rows and columns or formula, δ. */
  detail: string;
  source: string;
};

function finiteNumber(value: unknown): value is number {
  return typeof value === "number" && Number.isFinite(value);
}

/**
 * Breakdown (sparkover) voltage of one sphere gap, in peak volts. `index` names the gap in errors
 * (gaps[index].spacing_m). Throws HazardInputError for values neither method supports.
 */
export function gapBreakdown(gap: SparkGap, index = 0): GapBreakdown {
  const at = (field: string) => ["gaps", index, field];
  if (typeof gap !== "object" || gap === null)
    throw new HazardInputError(["gaps", index], "must be a spark gap object");
  const { sphereDiameter_m, spacing_m } = gap;
  if (!finiteNumber(sphereDiameter_m) || sphereDiameter_m <= 0) {
    throw new HazardInputError(at("sphereDiameter_m"), "must be a positive finite number of metres");
  }
  // Spheres above 10 m across are not bench apparatus; the cap keeps every figure finite.
  if (sphereDiameter_m > 10) throw new HazardInputError(at("sphereDiameter_m"), "must be at most 10 m");
  if (!finiteNumber(spacing_m) || spacing_m <= 0) {
    throw new HazardInputError(at("spacing_m"), "must be a positive finite number of metres");
  }
  if (spacing_m > MAX_GAP_SPACING_M * (1 + MATCH)) {
    throw new HazardInputError(
      at("spacing_m"),
      `${formatQuantity(spacing_m, "m")} is beyond 1 m (100 cm): neither the sphere-gap table nor the uniform-field law covers gaps that long`,
    );
  }
  const pressure_Pa = gap.pressure_Pa ?? DEFAULT_GAP_PRESSURE_PA;
  const temperature_C = gap.temperature_C ?? DEFAULT_GAP_TEMPERATURE_C;
  // 10 MPa (about 100 atmospheres) bounds any pressurised gap on a bench.
  if (!finiteNumber(pressure_Pa) || pressure_Pa <= 0 || pressure_Pa > 1e7) {
    throw new HazardInputError(at("pressure_Pa"), "must be a finite pressure above 0 Pa and at most 10 MPa");
  }
  // Absolute zero is −273.15 °C; above 1000 °C air is no longer the table's air.
  if (!finiteNumber(temperature_C) || temperature_C <= -ZERO_CELSIUS_K || temperature_C > 1000) {
    throw new HazardInputError(
      at("temperature_C"),
      "must be a finite temperature above −273.15 °C and at most 1000 °C",
    );
  }

  const delta = relativeAirDensity(pressure_Pa, temperature_C);
  const diameter_cm = sphereDiameter_m * 100;
  const spacing_cm = spacing_m * 100;
  const reduced_cm = delta * spacing_cm;
  if (reduced_cm < MIN_REDUCED_SPACING_CM * (1 - MATCH)) {
    throw new HazardInputError(
      at("spacing_m"),
      `spacing × relative air density is ${reduced_cm.toPrecision(3)} cm, below 0.01 cm (0.1 mm in sea-level air): ` +
        "neither the sphere-gap table nor the uniform-field law covers so small a gap or so thin an air",
    );
  }
  const air =
    `δ = ${delta.toFixed(3)} for air at ${formatQuantity(pressure_Pa, "Pa")} and ${temperature_C.toFixed(1)} °C ` +
    "(δ = (p / 101325 Pa)·(293.15 K / (273.15 + T)))";
  const gapText = `${formatQuantity(sphereDiameter_m, "m")} spheres ${formatQuantity(spacing_m, "m")} apart`;

  const table = readTable(diameter_cm, spacing_cm);
  if (table) {
    const factor = delta / TABLE_AIR_DENSITY;
    const breakdown_V = table.kV * 1000 * factor;
    const approximate =
      factor < 0.95 || factor > 1.05 ? "; outside 0.95–1.05 the linear density correction is approximate" : "";
    return {
      breakdown_V,
      method: "sphere-gap table",
      delta,
      detail:
        `${gapText} spark over at ${formatQuantity(breakdown_V, "V")} (sphere-gap table: ${table.detail}, ` +
        `${table.kV.toFixed(1)} kV at the table's air of 760 mmHg and 25 °C, scaled by δ / ${TABLE_AIR_DENSITY.toFixed(3)} ` +
        `= ${factor.toFixed(3)}; ${air}${approximate})`,
      source: SPHERE_GAP_SOURCE,
    };
  }

  const kV = uniformFieldBreakdown_kV(reduced_cm);
  const breakdown_V = kV * 1000;
  const why =
    diameter_cm < SPHERE_GAP_TABLE.columns[0].diameter_cm * (1 - MATCH) ||
    diameter_cm > SPHERE_GAP_TABLE.columns[SPHERE_GAP_TABLE.columns.length - 1].diameter_cm * (1 + MATCH)
      ? "the diameter is outside the table's 2.5–25 cm"
      : "the spacing is outside the table's range for this diameter";
  // Between spheres spaced wider than about their radius the field is far from uniform and sparks
  // over sooner, so the law's ceiling is then too high: the side that overstates the hazard.
  const nonUniform =
    spacing_cm > diameter_cm / 2
      ? "; the field between these spheres is far from uniform, so this ceiling errs high"
      : "";
  return {
    breakdown_V,
    method: "uniform-field law",
    delta,
    detail:
      `${gapText} spark over at ${formatQuantity(breakdown_V, "V")} (uniform-field law, as ${why}: ` +
      `V = 24.22·x + 6.08·√x kV with x = δ·d = ${delta.toFixed(3)} × ${spacing_cm.toPrecision(3)} cm = ${reduced_cm.toPrecision(3)} cm; ` +
      `${air}${nonUniform})`,
    source: UNIFORM_FIELD_SOURCE,
  };
}
