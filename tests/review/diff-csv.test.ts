import { describe, expect, it } from "vitest";
import { assessSetup } from "@/lib/hazard";
import { csvCell, toCsv } from "@/lib/review/csv";
import { revisionDiff } from "@/lib/review/diff";
import { buildContent, TIER_SETUPS } from "./support";

const person = { id: "00000000-0000-4000-8000-000000000001", name: "Rowan Teller" };

describe("the field-level diff between two revisions", () => {
  it("names changed event details, source values and the figures that follow, with units", () => {
    const before = buildContent({ tier: 3, title: "Capacitor bank demo", responsible: person });
    const after = structuredClone(before);
    after.event.lastDay = "2099-01-02";
    after.event.operators = [{ userId: null, name: "Sam Okafor", trained: true }];
    const source = after.apparatus.setup.sources[0] as { voltage_V: number };
    source.voltage_V = 5000;
    after.controls.additional = "Barrier at 1.5 m.";
    const diff = revisionDiff(
      { content: before, assessment: assessSetup(before.apparatus.setup) },
      { content: after, assessment: assessSetup(after.apparatus.setup) },
    );
    const byPath = Object.fromEntries(diff.map((d) => [d.path, d]));
    expect(byPath["event.lastDay"]).toMatchObject({
      section: "Event",
      before: before.event.lastDay,
      after: "2099-01-02",
    });
    expect(byPath["event.operators"]).toMatchObject({ before: "—", after: "Sam Okafor (trained)" });
    expect(byPath["apparatus.setup.sources[0].voltage_V"]).toMatchObject({
      section: "Energy sources",
      label: "Source 1 (Bank): Voltage",
      before: "10.0 kV",
      after: "5.00 kV",
    });
    // ½·C·V²: 1 µF at 10 kV holds 50 J; at 5 kV, 12.5 J.
    expect(byPath["figures.energy_J"]).toMatchObject({ section: "Figures", before: "50.0 J", after: "12.5 J" });
    expect(byPath["controls.additional"]).toMatchObject({ before: "—", after: "Barrier at 1.5 m." });
    expect(byPath["event.title"]).toBeUndefined();
    expect(diff.map((d) => d.section)).toEqual([...diff.map((d) => d.section)].sort((a, b) => order(a) - order(b)));
  });

  it("is empty for identical revisions and shows removed sources", () => {
    const one = buildContent({ tier: 2, responsible: person });
    const view = { content: one, assessment: assessSetup(one.apparatus.setup) };
    expect(revisionDiff(view, view)).toEqual([]);
    const two = structuredClone(one);
    two.apparatus.setup = {
      sources: [...one.apparatus.setup.sources, ...TIER_SETUPS[1].sources.map((s) => ({ ...s, id: "C2" }))],
    };
    const grown = revisionDiff(view, { content: two, assessment: assessSetup(two.apparatus.setup) });
    expect(grown.find((d) => d.path === "apparatus.setup.sources[1].capacitance_F")).toMatchObject({
      before: "—",
      after: "450 nF",
    });
    const shrunk = revisionDiff({ content: two, assessment: assessSetup(two.apparatus.setup) }, view);
    expect(shrunk.find((d) => d.path === "apparatus.setup.sources[1].capacitance_F")).toMatchObject({
      before: "450 nF",
      after: "—",
    });
  });
});

function order(section: string): number {
  return ["Event", "Apparatus", "Energy sources", "Spark gaps", "Controls", "Attachments", "Figures"].indexOf(section);
}

describe("CSV cells (RFC 4180, OWASP CSV injection)", () => {
  it("neutralises cells a spreadsheet would run as a formula", () => {
    expect(csvCell('=HYPERLINK("http://x")')).toBe(`"'=HYPERLINK(""http://x"")"`);
    expect(csvCell("+1")).toBe("'+1");
    expect(csvCell("-2+3")).toBe("'-2+3");
    expect(csvCell("@SUM(A1)")).toBe("'@SUM(A1)");
    expect(csvCell("\tcmd")).toBe("'\tcmd");
    expect(csvCell("plain text")).toBe("plain text");
  });

  it("quotes commas, quotes and line breaks, and writes CRLF rows", () => {
    expect(csvCell('say "hi", then\nleave')).toBe('"say ""hi"", then\nleave"');
    expect(csvCell(null)).toBe("");
    expect(csvCell(new Date("2026-03-01T10:00:00Z"))).toBe("2026-03-01T10:00:00.000Z");
    expect(csvCell({ a: 1 })).toBe('"{""a"":1}"');
    expect(toCsv(["a", "b"], [[1, "x,y"]])).toBe('a,b\r\n1,"x,y"\r\n');
  });
});
