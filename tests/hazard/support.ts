// Shared helpers for the hazard-engine tests: short builders for sources, a relative-tolerance
// matcher and a walk over every number in a result. Generators for property tests are in arbitraries.ts.

import { expect } from "vitest";
import { HazardInputError, type EnergySource, type SetupInput } from "@/lib/hazard";

/** Asserts |actual − expected| ≤ tolerance·|expected| (tolerance as a fraction, 0.03 = ±3 %). */
export function expectWithin(actual: number, expected: number, tolerance: number): void {
  const error = Math.abs(actual - expected);
  const allowed = Math.abs(expected) * tolerance;
  if (!(error <= allowed)) {
    expect.fail(`expected ${actual} to be within ${(tolerance * 100).toPrecision(3)} % of ${expected}`);
  }
}

export const cap = (capacitance_F: number, voltage_V: number, extra: Partial<EnergySource> = {}): EnergySource =>
  ({ kind: "capacitor", capacitance_F, voltage_V, ...extra }) as EnergySource;

export const dc = (voltage_V: number, currentLimit_A: number, extra: Record<string, unknown> = {}): EnergySource =>
  ({ kind: "dc-supply", voltage_V, currentLimit_A, ...extra }) as EnergySource;

export const ac = (voltageRms_V: number, currentLimit_A: number, frequency_Hz = 50): EnergySource => ({
  kind: "ac-supply",
  voltageRms_V,
  frequency_Hz,
  currentLimit_A,
});

export const setup = (...sources: EnergySource[]): SetupInput => ({ sources });

/** Runs `action` and returns the HazardInputError it throws, failing the test if it throws none. */
export function inputError(action: () => unknown): HazardInputError {
  try {
    action();
  } catch (error) {
    if (error instanceof HazardInputError) return error;
    throw error;
  }
  return expect.fail("expected a HazardInputError");
}

/** Every number anywhere inside `value`, with its path, for the "never NaN or Infinity" checks. */
export function numbersIn(value: unknown, path = "$"): Array<[string, number]> {
  if (typeof value === "number") return [[path, value]];
  if (Array.isArray(value)) return value.flatMap((item, index) => numbersIn(item, `${path}[${index}]`));
  if (value && typeof value === "object") {
    return Object.entries(value).flatMap(([key, item]) => numbersIn(item, `${path}.${key}`));
  }
  return [];
}
