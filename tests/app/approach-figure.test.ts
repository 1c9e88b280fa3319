import { describe, expect, it } from "vitest";
import { figureRows } from "@/app/_components/hazard/figures";
import { assessSetup, DEFAULT_RULES, type SetupInput } from "@/lib/hazard";

// The approach figure on the result screens. Above the last row of NFPA 70E's tables the engine gives
// no distance (null); the screen must say a qualified person sets it, never "none".

const approachValue = (setup: SetupInput) =>
  figureRows(assessSetup(setup), setup, DEFAULT_RULES).find((row) => row.key === "approach")?.value;

describe("approach distances on screen", () => {
  it("says a qualified person sets the distance above the table's last row (900 kV DC is above 800 kV)", () => {
    const setup: SetupInput = { sources: [{ id: "dome", kind: "sphere-terminal", radius_m: 1, voltage_V: 900e3 }] };
    expect(approachValue(setup)).toBe("beyond the published table: a qualified person sets them");
  });

  it("lists none below the tables (50 V DC is under NFPA 70E's 100 V DC floor)", () => {
    const setup: SetupInput = { sources: [{ id: "c", kind: "capacitor", capacitance_F: 1e-6, voltage_V: 50 }] };
    expect(approachValue(setup)).toBe("none listed");
  });
});
