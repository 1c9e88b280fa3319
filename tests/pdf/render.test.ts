import { describe, expect, it } from "vitest";
import { ABOUT_FIGURES_TEXT } from "@/lib/about-figures";
import { assessSetup, formatQuantity, type Tier } from "@/lib/hazard";
import { dischargeSteps } from "@/lib/pdf/content";
import { countPages, renderDocument } from "@/lib/pdf/render";
import type { PaperSize, PrintData } from "@/lib/pdf/types";
import { samplePrintData } from "./samples";
import { decodeQr, folded, pdfInfo, pdfPages, pdfText } from "./support";

// The printed permit and bench card, rendered from print snapshots (no database) and read back the
// way a person or a scanner would: text with pdftotext, page size with pdfinfo, the QR code
// rasterised by pdftoppm and decoded by jsqr.

/**
 * The figures each sample prints, worked by hand from tests/pdf/samples.ts (E = ½·C·V²; I_peak =
 * V / 500 Ω; continuous = min(limit, V / 500 Ω); t = R_b·C·ln(V / 60 V)), three significant digits.
 */
const EXPECTED: Record<
  Tier,
  { energy: string; voltage: string; peak: string; continuous: string; timeToSafe: string }
> = {
  // C = 4·π·ε0·0.05 m = 5.563 pF; E = ½·5.563 pF·(100 kV)² = 27.8 mJ; 100 kV / 500 Ω = 200 A; no bleeder.
  0: { energy: "27.8 mJ", voltage: "100 kV", peak: "200 A", continuous: "0 A", timeToSafe: "no bleeder" },
  // ½·100 nF·(1 kV)² = 50.0 mJ; 1 kV / 500 Ω = 2.00 A; 10 MΩ·100 nF·ln(1000/60) = 2.81 s.
  1: { energy: "50.0 mJ", voltage: "1.00 kV", peak: "2.00 A", continuous: "0 A", timeToSafe: "2.81 s" },
  // ½·10 nF·(10 kV)² = 500 mJ; 10 kV / 500 Ω = 20.0 A; 100 MΩ·10 nF·ln(10000/60) = 5.12 s.
  2: { energy: "500 mJ", voltage: "10.0 kV", peak: "20.0 A", continuous: "0 A", timeToSafe: "5.12 s" },
  // ½·1 µF·(10 kV)² = 50.0 J; 20.0 A; the 5 mA charger limits the continuous current; it has no bleeder.
  3: { energy: "50.0 J", voltage: "10.0 kV", peak: "20.0 A", continuous: "5.00 mA", timeToSafe: "no bleeder" },
  // ½·(4 × 100 µF)·(20 kV)² = 80.0 kJ; 20 kV / 500 Ω = 40.0 A; min(100 mA, 40 A) = 100 mA.
  4: { energy: "80.0 kJ", voltage: "20.0 kV", peak: "40.0 A", continuous: "100 mA", timeToSafe: "no bleeder" },
};

/**
 * The hazard header by tier, as the issue asks and ANSI Z535.4-2007 §4.14 / ISO 3864-2 define the
 * words: DANGER "will result in death or serious injury" (tiers 3–4: lethal shock, arc and blast),
 * WARNING "could result in death or serious injury" (tier 2), CAUTION "could result in minor or
 * moderate injury" (tier 1), no header for tier 0 (touch-safe).
 */
const SIGNAL_WORD: Record<Tier, string | null> = { 0: null, 1: "CAUTION", 2: "WARNING", 3: "DANGER", 4: "DANGER" };

function expectHazardHeader(text: string, tier: Tier) {
  for (const word of ["DANGER", "WARNING", "CAUTION"]) {
    if (word === SIGNAL_WORD[tier]) expect(text, `tier ${tier}`).toContain(word);
    else expect(text, `tier ${tier}`).not.toContain(word);
  }
  // The note about the figures is a note, not a sign: "Caution" never titles it.
  expect(text).not.toMatch(/Caution\./);
}

/** Page sizes in points: ISO 216 A4 is 210 × 297 mm; US Letter is 8.5 × 11 in (72 pt per inch). */
const PAGE_POINTS: Record<PaperSize, { width: number; height: number }> = {
  a4: { width: (210 / 25.4) * 72, height: (297 / 25.4) * 72 },
  letter: { width: 612, height: 792 },
};

const TIERS: Tier[] = [0, 1, 2, 3, 4];
const SIZES: PaperSize[] = ["a4", "letter"];

function expectPageSize(pdf: Buffer, size: PaperSize) {
  const info = pdfInfo(pdf);
  expect(info.width).toBeCloseTo(PAGE_POINTS[size].width, 0);
  expect(info.height).toBeCloseTo(PAGE_POINTS[size].height, 0);
  return info;
}

describe("the printed permit", () => {
  for (const tier of TIERS) {
    for (const size of SIZES) {
      it(`prints a tier ${tier} permit on ${size} with its number, hazard header, figures, signers, the note about the figures and a QR code to its page`, async () => {
        const data = samplePrintData(tier);
        const pdf = await renderDocument(data, "permit", size);
        expect(pdf.subarray(0, 5).toString()).toBe("%PDF-");
        expectPageSize(pdf, size);
        const text = pdfText(pdf);

        expect(text).toContain(data.permit.number);
        expect(text).toContain("ACTIVE");
        expect(text).toContain(`Tier ${tier}`);
        expect(text).toContain(data.permit.tierLabel);
        expect(text).toContain("1 Mar 2026 – 31 Mar 2026");
        expect(text).toContain(data.event.room);
        expect(text).toContain(data.holderName);
        expect(text).toContain("Owen Pryce");

        const want = EXPECTED[tier];
        expect(data.assessment.tier).toBe(tier);
        for (const figure of [want.energy, want.voltage, want.peak, want.continuous, want.timeToSafe]) {
          expect(text, figure).toContain(figure);
        }
        // Approach distances come from the engine's NFPA 70E table (lib/hazard/approach.ts, tested there).
        const { limited_m, restricted_m } = data.assessment.approach;
        if (limited_m !== null) expect(text).toContain(formatQuantity(limited_m, "m"));
        if (restricted_m !== null) expect(text).toContain(formatQuantity(restricted_m, "m"));

        for (const step of dischargeSteps(data.setup, data.assessment)) expect(text).toContain(folded(step));
        for (const contact of data.institution.emergencyContacts) expect(text).toContain(contact.phone);
        for (const control of data.controls) expect(text).toContain(folded(control.text));
        for (const condition of data.permit.conditions) expect(text).toContain(condition);

        if (data.signatures.length === 0) expect(text).toContain("self-certified");
        for (const signature of data.signatures) {
          expect(text).toContain(signature.name);
          expect(text).toContain(signature.role);
          expect(text).toContain(signature.meaning);
        }
        // Signed times in the institution's zone, named (samples.ts: 2026-02-25T09:30Z, Europe/London). London
        // keeps Greenwich Mean Time, UTC+0, in February; summer time starts in late March (memory).
        if (tier > 0) expect(text).toContain("2026-02-25 09:30 GMT");

        expect(text).toContain(folded(`About these figures. ${ABOUT_FIGURES_TEXT}`));
        expectHazardHeader(text, tier);
        expect(text).toContain(data.permit.verificationCode);
        expect(decodeQr(pdf)).toBe(data.permit.verificationUrl);
      });
    }
  }

  it("fits a tier 0 permit with its signatures on one A4 page", async () => {
    const pdf = await renderDocument(samplePrintData(0), "permit", "a4");
    expect(pdfInfo(pdf).pages).toBe(1);
    expect(countPages(pdf)).toBe(1);
  });

  it("prints the note about the figures and the permit number on every page of a longer permit", async () => {
    const data = samplePrintData(4);
    const pdf = await renderDocument(data, "permit", "letter");
    const pages = pdfPages(pdf);
    expect(pages.length).toBeGreaterThan(1);
    for (const page of pages) {
      expect(page).toContain(folded(`About these figures. ${ABOUT_FIGURES_TEXT}`));
      expect(page).toContain(data.permit.number);
    }
  });

  it("overprints a revoked permit with the word, the day and the reason", async () => {
    const data = samplePrintData(3, {
      state: "revoked",
      revokedOn: "2026-03-10",
      revokedReason: "The bleeder failed its check.",
    });
    const text = pdfText(await renderDocument(data, "permit", "a4"));
    expect(text).toContain("REVOKED");
    expect(text).toContain("do not run this set-up");
    expect(text).toContain("Revoked on 10 Mar 2026: The bleeder failed its check.");
    expect(text).not.toContain("ACTIVE");
  });

  it("overprints an expired permit and names its last valid day", async () => {
    const data = samplePrintData(2, { state: "expired" });
    const text = pdfText(await renderDocument(data, "permit", "a4"));
    expect(text).toContain("EXPIRED");
    expect(text).toContain("the last valid day was 31 Mar 2026");
    expect(text).not.toContain("ACTIVE");
  });
});

describe("sources a reader can follow", () => {
  // Issue 12: every reason and flag printed names its publication and clause, and nothing points at a
  // document the reader does not have (the internal "hazard-references §…" notes of engine 1).
  const INTERNAL = /hazard-references|§|\.md\b/;

  it("prints each deciding reason and flag of a tier 3 permit with its publication and clause", async () => {
    const data = samplePrintData(3);
    const text = pdfText(await renderDocument(data, "permit", "a4"));
    // 1 µF at 10 kV stores 50 J: the LBNL Electrical Safety Manual's capacitor row (≥ 100 V, ≥ 10 J),
    // Table 2.2.13; the 50 MΩ bleeder needs 256 s to reach 60 V, against IEC 60204-1 6.2.4's 5 s.
    expect(text).toContain(
      "Lawrence Berkeley National Laboratory (LBNL) Electrical Safety Manual (current web edition), Table 2.2.13",
    );
    expect(text).toContain("IEC 60204-1 (2016), 6.2.4");
    // the tier 3 criteria (approach rows and gap ceilings carry the tier too, but are figures' reasons)
    const reasons = data.assessment.reasons.filter(
      (r) => r.tier === 3 && !r.criterion.startsWith("approach") && r.criterion !== "gap-ceiling",
    );
    expect(reasons.length).toBeGreaterThan(0);
    expect(text.match(/Source: /g)?.length ?? 0).toBeGreaterThanOrEqual(reasons.length + data.assessment.flags.length);
    expect(text).not.toMatch(INTERNAL);
  });

  it.each([0, 1, 2, 4] as Tier[])("names no internal file on a tier %s permit or bench card", async (tier) => {
    const data = samplePrintData(tier);
    for (const kind of ["permit", "bench-card"] as const) {
      expect(pdfText(await renderDocument(data, kind, "a4"))).not.toMatch(INTERNAL);
    }
  });

  it("prints a permit stored by engine 1 without its internal pointers, keeping the publication", async () => {
    const data = samplePrintData(3);
    // The shape engine 1 stored: source text with a pointer into a working file, no reference id.
    data.assessment = {
      ...data.assessment,
      engineVersion: "1.2.0",
      reasons: data.assessment.reasons.map(({ ref: _ref, ...r }) => ({
        ...r,
        source: "LBNL Electrical Safety Manual, Table 2.2.13 (hazard-references §1a)",
      })),
      flags: data.assessment.flags.map(({ ref: _ref, ...f }) => ({ ...f, source: "hazard-references §6a" })),
    };
    const text = pdfText(await renderDocument(data, "permit", "a4"));
    expect(text).toContain("LBNL Electrical Safety Manual, Table 2.2.13");
    expect(text).not.toMatch(INTERNAL);
  });

  it("says a qualified person sets the approach distance above the last published row, never 'none'", async () => {
    const data = samplePrintData(0);
    // 900 kV DC is above NFPA 70E Table 130.4(E)(b)'s last row (500.1–800 kV): no published distance.
    data.setup = { sources: [{ id: "Dome", kind: "sphere-terminal", radius_m: 1, voltage_V: 900e3 }] };
    data.assessment = assessSetup(data.setup);
    expect(data.assessment.approach.limited_m).toBeNull();
    for (const kind of ["permit", "bench-card"] as const) {
      const text = pdfText(await renderDocument(data, kind, "a4"));
      expect(text, kind).toContain("set by a qualified person");
      expect(text, kind).not.toMatch(/approach\s+none/i);
    }
  });
});

describe("the bench card", () => {
  const variants: Array<[Tier, PrintData["permit"]["state"]]> = [
    [0, "active"],
    [1, "active"],
    [2, "expired"],
    [3, "active"],
    [4, "revoked"],
  ];
  for (const [tier, state] of variants) {
    for (const size of SIZES) {
      it(`fits a tier ${tier} ${state} card on one ${size} page with the discharge steps, contacts, state and QR code`, async () => {
        const data = samplePrintData(tier, { state, revokedOn: state === "revoked" ? "2026-03-10" : null });
        const pdf = await renderDocument(data, "bench-card", size);
        const info = expectPageSize(pdf, size);
        expect(info.pages).toBe(1);
        const text = pdfText(pdf);
        expect(text).toContain(data.permit.number);
        expect(text).toContain(state.toUpperCase());
        expect(text).toContain(`Tier ${tier}`);
        for (const step of dischargeSteps(data.setup, data.assessment)) expect(text).toContain(folded(step));
        for (const contact of data.institution.emergencyContacts) {
          expect(text).toContain(contact.label);
          expect(text).toContain(contact.phone);
        }
        expect(text).toContain(folded(`About these figures. ${ABOUT_FIGURES_TEXT}`));
        expectHazardHeader(text, tier);
        expect(decodeQr(pdf)).toBe(data.permit.verificationUrl);
      });
    }
  }

  it("stays on one page with a long procedure and many contacts by shrinking its type", async () => {
    const data = samplePrintData(4, {
      state: "revoked",
      revokedOn: "2026-03-10",
      revokedReason: "x ".repeat(120).trim(),
    });
    data.institution.emergencyContacts = Array.from({ length: 5 }, (_, i) => ({
      label: `Contact ${i + 1} with a long description of when to call`,
      phone: `+44 20 7946 01${i}${i}`,
    }));
    data.setup = {
      ...data.setup,
      sources: data.setup.sources.map((s, i) => ({
        ...s,
        id: `Source with a deliberately long label number ${i + 1}`,
      })),
    };
    const pdf = await renderDocument(data, "bench-card", "letter");
    expect(pdfInfo(pdf).pages).toBe(1);
    expect(pdfText(pdf)).toContain("+44 20 7946 0144");
  });
});

describe("what the people at the bench read (issue 20)", () => {
  for (const size of SIZES) {
    it(`prints the event days, the audience and the apparatus on the ${size} permit and bench card`, async () => {
      const base = samplePrintData(2);
      const data: PrintData = {
        ...base,
        event: {
          ...base.event,
          kindLabel: "Outreach event",
          audienceLabel: "Members of the public",
          audienceSize: 80,
          firstDay: "2027-01-15",
          lastDay: "2027-01-15",
        },
        permit: { ...base.permit, validFrom: "2027-01-15", validTo: "2027-01-15" },
      };
      for (const kind of ["permit", "bench-card"] as const) {
        const text = folded(pdfText(await renderDocument(data, kind, size)));
        expect(text, kind).toContain("15 Jan 2027");
        expect(text, kind).toContain("80 members of the public");
        expect(text, kind).toContain(data.apparatus.name);
      }
    });
  }

  it("prints the approver's reason for a window beyond the event days on the permit", async () => {
    const data = samplePrintData(3, { validityReason: "Two rehearsals in the week before." });
    const text = folded(pdfText(await renderDocument(data, "permit", "a4")));
    expect(text).toContain("Beyond the event days because: Two rehearsals in the week before.");
  });

  it("rates the probe for the voltage the bank is charged toward, not the gap-limited voltage", async () => {
    // The set-up: a pair of jars charged toward 40 kV across a sphere gap that breaks down
    // lower. 2 cm spheres 0.8 cm apart break down near 26 kV peak in standard air (IEC 60052 table,
    // memory); the engine's own figure is only checked to be below the charging voltage.
    const base = samplePrintData(2);
    const setup = {
      sources: [
        {
          id: "Jars",
          kind: "capacitor" as const,
          capacitance_F: 1e-9,
          count: 2,
          arrangement: "parallel" as const,
          voltage_V: 40e3,
          bleeder_ohm: 1e9,
        },
      ],
      // Engine v2: a gap caps only the sources it is connected across.
      gaps: [{ sphereDiameter_m: 0.02, spacing_m: 0.008, across: ["Jars"] }],
    };
    const { assessSetup } = await import("@/lib/hazard");
    const assessment = assessSetup(setup);
    expect(assessment.maxVoltage_V).toBeLessThan(40e3);
    const data: PrintData = { ...base, setup, assessment };
    const text = folded(pdfText(await renderDocument(data, "bench-card", "a4")));
    // The charging voltage as typed: 40 kV.
    expect(text).toContain("probe rated for 40.0 kV");
    expect(text).not.toContain(`probe rated for ${formatQuantity(assessment.maxVoltage_V, "V")}`);
  });
});
