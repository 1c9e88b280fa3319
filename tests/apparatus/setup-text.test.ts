import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { editableQuantity, setupFromText, setupToText } from "@/lib/apparatus/setup-text";
import { assessSetup, parseQuantity, type Dimension, type SetupInput } from "@/lib/hazard";
import { setupTextSchema } from "@/lib/apparatus/schemas";
import { decades, setupArb } from "../hazard/arbitraries";

// The text form of a set-up (what the form shows and autosaves) against the engine's numbers.

describe("editableQuantity", () => {
  it("writes the usual notation for bench values", () => {
    expect(editableQuantity(4.7e-9, "capacitance")).toBe("4.7 nF");
    expect(editableQuantity(30_000, "voltage")).toBe("30 kV");
    expect(editableQuantity(0.005, "length")).toBe("5 mm");
    expect(editableQuantity(2e6, "resistance")).toBe("2 MΩ");
    expect(editableQuantity(101_325, "pressure")).toBe("101.325 kPa");
    expect(editableQuantity(-12.5, "temperature")).toBe("-12.5 °C");
  });

  const dimensions: Dimension[] = [
    "capacitance",
    "voltage",
    "resistance",
    "length",
    "current",
    "frequency",
    "pressure",
  ];
  it("always reads back to exactly the same number", () => {
    fc.assert(
      fc.property(decades(-15, 15), fc.constantFrom(...dimensions), (value, dimension) => {
        const text = editableQuantity(value, dimension);
        const read = parseQuantity(text, dimension);
        expect(read.ok && read.value).toBe(value);
      }),
      { numRuns: 2000 },
    );
  });
});

describe("setupToText and setupFromText", () => {
  /** Ids are labels people type (trimmed); a false flag and an empty gap list are the defaults. */
  const plain = setupArb.map((s): SetupInput => {
    const out: SetupInput = { sources: s.sources.map(({ id: _id, ...rest }) => rest as SetupInput["sources"][number]) };
    // without labels a source is "source-N" to the engine and to the text form alike
    const rename = (name: string) =>
      `source-${s.sources.findIndex((src, i) => (src.id ?? `source-${i + 1}`) === name) + 1}`;
    if (s.gaps && s.gaps.length > 0) out.gaps = s.gaps.map((g) => ({ ...g, across: (g.across ?? []).map(rename) }));
    if (s.bleeders && s.bleeders.length > 0)
      out.bleeders = s.bleeders.map((b) => ({ ...b, across: b.across.map(rename) }));
    if (s.bodyResistance_ohm !== undefined) out.bodyResistance_ohm = s.bodyResistance_ohm;
    if (s.vacuumDevice) out.vacuumDevice = true;
    return out;
  });

  it("round-trips any valid set-up exactly, so the figures from the text are the figures of the numbers", () => {
    fc.assert(
      fc.property(plain, (setup) => {
        const text = setupTextSchema.parse(JSON.parse(JSON.stringify(setupToText(setup))));
        const back = setupFromText(text);
        // -0 (say, -0 °C) reads back as 0: the same quantity; JSON, like the stored draft, has no -0.
        const expected = JSON.parse(JSON.stringify(setup)) as SetupInput;
        expect(back.issues).toEqual([]);
        expect(back.setup).toEqual(expected);
        expect(assessSetup(back.setup!)).toEqual(assessSetup(expected));
      }),
      { numRuns: 300 },
    );
  });

  it("names the field of every unreadable or missing value, and of the engine's own refusals", () => {
    const text = setupTextSchema.parse({
      sources: [
        { kind: "capacitor", capacitance_F: "4.7 mfd", voltage_V: "" },
        { kind: "capacitor", capacitance_F: "1 nF", voltage_V: "1 kV", count: "two" },
      ],
      gaps: [{ sphereDiameter_m: "5 cm", spacing_m: "5 kV" }],
    });
    expect(setupFromText(text).issues.map((i) => i.path.join("."))).toEqual([
      "sources.0.capacitance_F",
      "sources.0.voltage_V",
      "sources.1.count",
      "gaps.0.spacing_m",
    ]);
    const series = setupTextSchema.parse({
      sources: [{ kind: "capacitor", capacitance_F: "1 nF", voltage_V: "1 kV", count: "1", arrangement: "series" }],
    });
    expect(setupFromText(series).issues).toEqual([
      { path: ["sources", 0, "count"], message: "A series bank needs at least 2 capacitors." },
    ]);
    expect(setupFromText(setupTextSchema.parse({})).issues).toEqual([
      { path: ["sources"], message: "Add at least one energy source." },
    ]);
  });
});
