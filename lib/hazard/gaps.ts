// The voltage at which a sphere gap sparks over: the ceiling no part of the set-up can charge past.
// Inside the published sphere-gap table (hazard-references §4c) the table is interpolated; elsewhere
// the empirical uniform-field law for air (§4b) is used. Both are corrected for air density.

import { HazardInputError } from "./errors";
import { citation } from "./references";
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

export const SPHERE_GAP_SOURCE = `${citation("aiee-sphere-gap")}; tolerance and density correction: ${citation("iec-60052")}`;
export const UNIFORM_FIELD_SOURCE = citation("uniform-field-law");

/** IEC 60052's stated uncertainty of the sphere-gap values: ±3 % for S ≤ D/2, ±5 % for D/2 < S ≤ D. */
export const TABLE_TOLERANCE_NEAR = 0.03;
export const TABLE_TOLERANCE_FAR = 0.05;
/** Beyond S = D the standard states no uncertainty; 10 % is this product's cautious margin. */
export const TABLE_TOLERANCE_BEYOND = 0.1;
/** The uniform-field law is an empirical fit; 5 % is this product's cautious margin on it. */
export const UNIFORM_FIELD_MARGIN = 0.05;

// [spacing cm, peak kV] rows of each column: every row the reproduced AIEE table prints, air at
// 760 mmHg and 25 °C. Columns stop where the table gives no value.
const KV = [
  5, 10, 15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110, 120, 130, 140, 150, 160, 170, 180, 190, 200, 210,
  220, 230, 240, 250, 300,
] as const;
const column = (diameter_cm: number, gaps: readonly number[]) => ({
  diameter_cm,
  rows: gaps.map((gap_cm, i) => [gap_cm, KV[i]] as const),
});

/** Sparkover voltages of sphere gaps (peak kV) against spacing (cm), one column per sphere diameter. */
export const SPHERE_GAP_TABLE = {
  pressure_Pa: STANDARD_PRESSURE_PA,
  temperature_C: 25,
  columns: [
    column(2.5, [0.13, 0.27, 0.42, 0.58, 0.76, 0.95, 1.17, 1.41, 1.68, 2.0, 2.82, 4.05]),
    column(5, [0.15, 0.29, 0.44, 0.6, 0.77, 0.94, 1.12, 1.3, 1.5, 1.71, 2.17, 2.68, 3.26, 3.94, 4.77, 5.79, 7.07]),
    column(
      10,
      [
        0.15, 0.3, 0.46, 0.62, 0.78, 0.95, 1.12, 1.29, 1.47, 1.65, 2.02, 2.42, 2.84, 3.28, 3.75, 4.25, 4.78, 5.35, 5.97,
        6.64, 7.37, 8.16, 9.03, 10.0, 11.1, 12.3, 13.7, 15.3,
      ],
    ),
    column(
      25,
      [
        0.16, 0.32, 0.48, 0.64, 0.81, 0.98, 1.15, 1.32, 1.49, 1.66, 2.01, 2.37, 2.74, 3.11, 3.49, 3.88, 4.28, 4.69, 5.1,
        5.52, 5.95, 6.39, 6.84, 7.3, 7.76, 8.24, 8.73, 9.24, 9.76, 10.3, 13.3,
      ],
    ),
  ],
};

export type SphereGapColumn = { diameter_cm: number; rows: ReadonlyArray<readonly [number, number]> };

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

/**
 * Monotone cubic (PCHIP, Fritsch–Carlson) through the rows: follows the bend of the curve where
 * straight lines between rows read up to 7 % low, and never overshoots between two rows.
 */
export function pchip(rows: ReadonlyArray<readonly [number, number]>, x: number): number {
  const n = rows.length;
  const h: number[] = [];
  const delta: number[] = [];
  for (let i = 0; i < n - 1; i++) {
    h.push(rows[i + 1][0] - rows[i][0]);
    delta.push((rows[i + 1][1] - rows[i][1]) / h[i]);
  }
  const d = new Array<number>(n).fill(0);
  for (let i = 1; i < n - 1; i++) {
    if (delta[i - 1] * delta[i] > 0) {
      const w1 = 2 * h[i] + h[i - 1];
      const w2 = h[i] + 2 * h[i - 1];
      d[i] = (w1 + w2) / (w1 / delta[i - 1] + w2 / delta[i]);
    }
  }
  const end = (h0: number, h1: number, m0: number, m1: number) => {
    let slope = ((2 * h0 + h1) * m0 - h0 * m1) / (h0 + h1);
    if (Math.sign(slope) !== Math.sign(m0)) slope = 0;
    else if (Math.sign(m0) !== Math.sign(m1) && Math.abs(slope) > Math.abs(3 * m0)) slope = 3 * m0;
    return slope;
  };
  if (n === 2) {
    d[0] = d[1] = delta[0];
  } else {
    d[0] = end(h[0], h[1], delta[0], delta[1]);
    d[n - 1] = end(h[n - 2], h[n - 3], delta[n - 2], delta[n - 3]);
  }
  let i = 0;
  while (i < n - 2 && x > rows[i + 1][0]) i++;
  const t = (x - rows[i][0]) / h[i];
  const t2 = t * t;
  const t3 = t2 * t;
  return (
    (2 * t3 - 3 * t2 + 1) * rows[i][1] +
    (t3 - 2 * t2 + t) * h[i] * d[i] +
    (-2 * t3 + 3 * t2) * rows[i + 1][1] +
    (t3 - t2) * h[i] * d[i + 1]
  );
}

type ColumnReading = { kV: number; rows: string };

/** Peak kV at table air for a spacing inside one column. */
function readColumn(col: SphereGapColumn, spacing_cm: number): ColumnReading | null {
  const rows = col.rows;
  const first = rows[0][0];
  const last = rows[rows.length - 1][0];
  if (spacing_cm < first * (1 - MATCH) || spacing_cm > last * (1 + MATCH)) return null;
  const at = rows.find(([gap]) => Math.abs(spacing_cm - gap) <= gap * MATCH);
  if (at) return { kV: at[1], rows: `the ${at[1]} kV row (${at[0]} cm)` };
  const kV = pchip(rows, spacing_cm);
  const i = rows.findIndex(([gap]) => gap > spacing_cm);
  return {
    kV,
    rows: `between the ${rows[i - 1][1]} kV row (${rows[i - 1][0]} cm) and the ${rows[i][1]} kV row (${rows[i][0]} cm), monotone cubic through every row`,
  };
}

type TableReading = { kV: number; detail: string };

export function readSphereGapTable(
  diameter_cm: number,
  spacing_cm: number,
  columns: readonly SphereGapColumn[],
): TableReading | null {
  for (const col of columns) {
    if (Math.abs(diameter_cm - col.diameter_cm) <= col.diameter_cm * MATCH) {
      const reading = readColumn(col, spacing_cm);
      return reading && { kV: reading.kV, detail: `${col.diameter_cm} cm column, ${reading.rows}` };
    }
  }
  for (let i = 0; i < columns.length - 1; i++) {
    const low = columns[i];
    const high = columns[i + 1];
    if (diameter_cm > low.diameter_cm && diameter_cm < high.diameter_cm) {
      const a = readColumn(low, spacing_cm);
      const b = readColumn(high, spacing_cm);
      // Between two columns the higher of the two readings is used: at short spacings the smaller
      // spheres spark over a little higher, at long ones the larger; either way the ceiling errs high.
      if (a && b) {
        const higher = a.kV >= b.kV ? { col: low, reading: a } : { col: high, reading: b };
        return {
          kV: higher.reading.kV,
          detail:
            `between the ${low.diameter_cm} cm column (${a.kV.toFixed(1)} kV) and the ${high.diameter_cm} cm column ` +
            `(${b.kV.toFixed(1)} kV); the higher, ${higher.col.diameter_cm} cm (${higher.reading.rows}), is used`,
        };
      }
      // Past the smaller column's last row only the larger column reads; larger spheres hold more at
      // long spacings, so its value errs high for the spheres in between.
      const lastOfLow = low.rows[low.rows.length - 1][0];
      if (b && spacing_cm > lastOfLow) {
        return {
          kV: b.kV,
          detail: `${high.diameter_cm} cm column (${b.rows}), the larger spheres, as the ${low.diameter_cm} cm column ends at ${lastOfLow} cm`,
        };
      }
      return null;
    }
  }
  return null;
}

export type GapMethod = "sphere-gap table" | "uniform-field law";

export type GapBreakdown = {
  /** Nominal breakdown, peak V. */
  breakdown_V: number;
  /** Relative uncertainty of the nominal value the ceiling allows for (0.03 = ±3 %). */
  tolerance: number;
  /** The ceiling used: nominal × (1 + tolerance), peak V. Errs high, as a low ceiling understates. */
  bound_V: number;
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

  const table = readSphereGapTable(diameter_cm, spacing_cm, SPHERE_GAP_TABLE.columns);
  if (table) {
    const factor = delta / TABLE_AIR_DENSITY;
    const breakdown_V = table.kV * 1000 * factor;
    const tolerance =
      spacing_cm <= diameter_cm / 2
        ? TABLE_TOLERANCE_NEAR
        : spacing_cm <= diameter_cm
          ? TABLE_TOLERANCE_FAR
          : TABLE_TOLERANCE_BEYOND;
    const toleranceWhy =
      tolerance === TABLE_TOLERANCE_NEAR
        ? "±3 % for a spacing up to half the diameter (IEC 60052)"
        : tolerance === TABLE_TOLERANCE_FAR
          ? "±5 % for a spacing between half and one diameter (IEC 60052)"
          : "10 % beyond one diameter, where IEC 60052 states no accuracy (this product's cautious margin)";
    const bound_V = breakdown_V * (1 + tolerance);
    const approximate =
      factor < 0.95 || factor > 1.05 ? "; outside 0.95–1.05 the linear density correction is approximate" : "";
    return {
      breakdown_V,
      tolerance,
      bound_V,
      method: "sphere-gap table",
      delta,
      detail:
        `${gapText} spark over at ${formatQuantity(breakdown_V, "V")} nominal, at most ${formatQuantity(bound_V, "V")} ` +
        `allowing ${toleranceWhy} (sphere-gap table: ${table.detail}, ` +
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
  const bound_V = breakdown_V * (1 + UNIFORM_FIELD_MARGIN);
  return {
    breakdown_V,
    tolerance: UNIFORM_FIELD_MARGIN,
    bound_V,
    method: "uniform-field law",
    delta,
    detail:
      `${gapText} spark over at ${formatQuantity(breakdown_V, "V")} nominal, at most ${formatQuantity(bound_V, "V")} ` +
      `allowing a 5 % margin on an empirical law (uniform-field law, as ${why}: ` +
      `V = 24.22·x + 6.08·√x kV with x = δ·d = ${delta.toFixed(3)} × ${spacing_cm.toPrecision(3)} cm = ${reduced_cm.toPrecision(3)} cm; ` +
      `${air}${nonUniform})`,
    source: UNIFORM_FIELD_SOURCE,
  };
}
