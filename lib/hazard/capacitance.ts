// Capacitance of the shapes found on a demonstration bench, so an instructor can estimate a source
// they cannot measure. All lengths in metres, results in farads.

import { HazardInputError } from "./errors";

/** Vacuum permittivity ε0 in F/m (CODATA 2022 recommended value). */
export const EPSILON_0_F_PER_M = 8.8541878188e-12;

function requirePositive(name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new HazardInputError([name], "must be a positive finite number");
  }
}

/** Isolated sphere far from other conductors: C = 4·π·ε0·r. */
export function sphereCapacitance_F(radius_m: number): number {
  requirePositive("radius_m", radius_m);
  return 4 * Math.PI * EPSILON_0_F_PER_M * radius_m;
}

/** Coaxial cylinders (a jar with inner and outer foil): C = 2·π·ε0·εr·L / ln(b/a). Edge fields are
 * ignored, which underestimates a short jar by a few per cent. */
export function coaxialCapacitance_F(
  length_m: number,
  innerRadius_m: number,
  outerRadius_m: number,
  relativePermittivity = 1,
): number {
  requirePositive("length_m", length_m);
  requirePositive("innerRadius_m", innerRadius_m);
  requirePositive("outerRadius_m", outerRadius_m);
  requirePositive("relativePermittivity", relativePermittivity);
  if (!(outerRadius_m > innerRadius_m)) {
    throw new HazardInputError(["outerRadius_m"], "must be larger than innerRadius_m");
  }
  return (2 * Math.PI * EPSILON_0_F_PER_M * relativePermittivity * length_m) / Math.log(outerRadius_m / innerRadius_m);
}

/** Parallel plates with a gap small against their size: C = ε0·εr·A / d. */
export function parallelPlateCapacitance_F(area_m2: number, separation_m: number, relativePermittivity = 1): number {
  requirePositive("area_m2", area_m2);
  requirePositive("separation_m", separation_m);
  requirePositive("relativePermittivity", relativePermittivity);
  return (EPSILON_0_F_PER_M * relativePermittivity * area_m2) / separation_m;
}
