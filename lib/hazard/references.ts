// The publications the engine's numbers come from, as a reader can follow them: title, edition,
// clause, and how the value was obtained (read in a published text, recalled from memory, or a rule
// of the trade). Every threshold, reason and flag carries one of these ids in `ref`, and its `source`
// text is built from the same entry, so the References page, the screens and the PDF agree.

export type ReferenceStatus = "read" | "memory" | "common practice";

export type Reference = {
  id: string;
  /** Publication title as a reader would look it up. */
  title: string;
  /** Edition or year; "" when the publication has none. */
  edition: string;
  /** Clause, table or figure. */
  clause: string;
  status: ReferenceStatus;
  /** Where the value was read, or what is uncertain about it. */
  note: string;
};

const r = (
  id: string,
  title: string,
  edition: string,
  clause: string,
  status: ReferenceStatus,
  note: string,
): Reference => ({ id, title, edition, clause, status, note });

export const REFERENCES: readonly Reference[] = [
  r(
    "lbnl-esm-2-2-13",
    "Lawrence Berkeley National Laboratory (LBNL) Electrical Safety Manual",
    "current web edition",
    "Table 2.2.13 (hazard thresholds: shock, arc flash, thermal)",
    "read",
    "Read on the laboratory's electrical-safety page: capacitors ≥ 100 V and ≥ 10 J (shock), ≥ 10 kJ (arc flash), < 100 V and > 100 J (thermal); DC ≥ 100 V and ≥ 40 mA (shock), ≥ 500 A (arc flash); AC ≥ 50 V and ≥ 5 mA (shock); AC power ≥ 250 V (arc flash); DC thermal printed as > 100 V and > 1000 W, read here as below 100 V like the battery row.",
  ),
  r(
    "capacitor-discharge-guideline",
    "Discharge of Capacitors (one-page laboratory guideline)",
    "publisher not shown",
    "whole sheet",
    "read",
    "0.25 J gives a heavy shock; above 10 J into the body can be lethal; above 0.1 J provide a means to discharge.",
  ),
  r(
    "iec-60335-1-8-1-4",
    "IEC 60335-1, Household and similar electrical appliances – Safety – Part 1: General requirements",
    "edition as quoted",
    "8.1.4 (protective impedance: capacitance, charge and discharge-energy levels)",
    "read",
    "Read in quoted text: ≤ 0.1 µF for 42.4–450 V peak, ≤ 45 µC for 450 V–15 kV, ≤ 350 mJ above 15 kV; ≤ 2 mA DC.",
  ),
  r(
    "iec-61010-1-6-3",
    "IEC 61010-1, Safety requirements for electrical equipment for measurement, control, and laboratory use",
    "2nd edition (2001)",
    "6.3.1 (levels in normal condition)",
    "read",
    "Touch current 0.5 mA rms AC and 2 mA DC read in an instrument manual that reproduces the clause; the clause number is from memory.",
  ),
  r(
    "iec-62368-1-es1",
    "IEC 62368-1, Audio/video, information and communication technology equipment – Safety requirements",
    "3rd edition (2018)",
    "5.2.2 (ES1 limits: 30 V rms, 60 V DC)",
    "memory",
    "The ES1 voltage limits are recalled, not read; they match the older SELV limit of IEC 60950-1.",
  ),
  r(
    "iec-62368-1-es2",
    "IEC 62368-1, Audio/video, information and communication technology equipment – Safety requirements",
    "3rd edition (2018)",
    "5.2.2 (ES2 touch-current limits: 5 mA rms, 25 mA DC)",
    "memory",
    "The ES2 limits are recalled, not read. They are product-class limits, not a let-go threshold.",
  ),
  r(
    "iec-60479-1-impedance",
    "IEC TS 60479-1, Effects of current on human beings and livestock – Part 1: General aspects",
    "4th edition (2005) with amendment 1 (2016)",
    "Table 1 (total body impedance, hand to hand, large contact area)",
    "read",
    "The asymptotic hand-to-hand impedance not exceeded by 5 % of people is in the order of 500–650 Ω (read in a reproduction of the table); 500 Ω is the low, cautious end.",
  ),
  r(
    "iec-60479-1-zones",
    "IEC TS 60479-1, Effects of current on human beings and livestock – Part 1: General aspects",
    "4th edition (2005) with amendment 1 (2016)",
    "Figure 20 (time/current zones, AC 15–100 Hz: curve c1)",
    "read",
    "Read in a textbook reproducing the zones: fibrillation is possible for shocks below 0.1 s above 500 mA; long shocks fibrillate at about 50 mA.",
  ),
  r(
    "iec-60364-4-41-rcd",
    "IEC 60364-4-41, Low-voltage electrical installations – Protection against electric shock",
    "2005 with amendment 1 (2017)",
    "411.3.3 (additional protection by a residual current device of 30 mA)",
    "memory",
    "30 mA is the rated residual current of the device required for additional protection; used here as the AC current at which a shock is treated as lethal.",
  ),
  r(
    "iec-60479-2-impulse",
    "IEC 60479-2, Effects of current on human beings and livestock – Part 2: Special aspects",
    "2019",
    "clause 10 (effects of capacitor discharges; specific fibrillating energy ∫i²dt)",
    "memory",
    "The standard's data cover impulses of 0.1–10 ms (read in its catalogue entry). The threshold used, 0.0025 A²s, is the specific energy of 500 mA for 10 ms at curve c1 of IEC 60479-1; the standard's own figure was not read.",
  ),
  r(
    "iec-60204-1-6-2-4",
    "IEC 60204-1, Safety of machinery – Electrical equipment of machines – Part 1: General requirements",
    "2016",
    "6.2.4 (protection against residual voltages)",
    "read",
    "Read in a translation of the clause: parts above 60 V discharged to 60 V or less within 5 s; parts storing 60 µC or less exempt.",
  ),
  r(
    "iec-60052",
    "IEC 60052, Voltage measurement by means of standard air gaps",
    "3rd edition (2002)",
    "clause on accuracy of the tables (±3 % for S ≤ D/2, ±5 % for D/2 < S ≤ D) and the air-density correction k = δ",
    "read",
    "The tolerances are read in a reproduction of the standard's tables; k = δ for 0.95 < δ < 1.05 is recalled.",
  ),
  r(
    "aiee-sphere-gap",
    "Spark-gap voltages, based on the sphere-gap results of the American Institute of Electrical Engineers",
    "AIEE standard calibration (reproduced table)",
    "sparkover of 2.5, 5, 10 and 25 cm spheres, air at 760 mmHg and 25 °C, every row from 5 kV to 300 kV",
    "read",
    "Every row of the four columns was read in a reproduction of the table.",
  ),
  r(
    "uniform-field-law",
    "Empirical breakdown law for air in a uniform field, V = 24.22·δd + 6.08·√(δd) kV (d in cm)",
    "as tabulated in high-voltage laboratory references",
    "—",
    "read",
    "Read in a high-voltage reference page; gives 30.3 kV at 1 cm. The engine adds a 5 % margin (common practice) because the law is empirical.",
  ),
  r(
    "nfpa-70e-130-4-e-a",
    "NFPA 70E, Standard for Electrical Safety in the Workplace",
    "2018",
    "Table 130.4(E)(a), shock approach boundaries, AC",
    "read",
    "Rows from 151 V to 36 kV read in reproductions of the 2018 table; rows from 36.1 kV to 550 kV read in a reproduction of an earlier edition's AC table (feet and inches; the limited and restricted distances are the 2018 metric values rounded); the 50–150 V and 765–800 kV rows are recalled.",
  ),
  r(
    "nfpa-70e-130-4-e-b",
    "NFPA 70E, Standard for Electrical Safety in the Workplace",
    "2018",
    "Table 130.4(E)(b), shock approach boundaries, DC",
    "memory",
    "The 301 V–1 kV row was read in a worked example; the other rows are recalled.",
  ),
  r(
    "min-ignition-energy",
    "NFPA 921, Guide for Fire and Explosion Investigations: minimum ignition energy of flammable gases in air",
    "2017",
    "table of gaseous fuel characteristics (as quoted in a university fire-investigation course)",
    "read",
    "Read: methane 0.28 mJ, propane 0.25 mJ, hydrogen 0.019 mJ. The 0.2 mJ used is below the common hydrocarbons; hydrogen ignites with about a tenth of it.",
  ),
  r(
    "xray-practice",
    "Practitioner reports of x-rays from vacuum devices driven at high voltage",
    "Health Physics (2017) and practitioners' reports",
    "—",
    "common practice",
    "Measurable dose is reported from about 10 kV; no published threshold was found.",
  ),
  r(
    "osha-ozone",
    "OSHA 29 CFR 1910.1000 Table Z-1 (ozone 0.1 ppm); open sparks and corona make ozone",
    "current",
    "Table Z-1",
    "common practice",
    "The exposure limit is read; that gaps and corona make ozone is a rule of the trade.",
  ),
  r(
    "bench-practice",
    "Rule of the trade for high-voltage benches",
    "",
    "—",
    "common practice",
    "No single published source.",
  ),
  r(
    "benchclear-plausibility",
    "Benchclear's plausibility checks",
    "",
    "—",
    "common practice",
    "Figures outside what a part of the kind can be usually come from a mistyped unit prefix; the user is asked to confirm.",
  ),
];

const BY_ID = new Map(REFERENCES.map((ref) => [ref.id, ref]));

export function referenceById(id: string): Reference | undefined {
  return BY_ID.get(id);
}

const STATUS_TEXT: Record<ReferenceStatus, string> = {
  read: "read in the text",
  memory: "from memory",
  "common practice": "common practice",
};

export function statusText(status: ReferenceStatus): string {
  return STATUS_TEXT[status];
}

/** "IEC 60204-1 (2016), 6.2.4 (…) — read in the text" */
export function citation(id: string): string {
  const ref = BY_ID.get(id);
  if (!ref) return id;
  const edition = ref.edition ? ` (${ref.edition})` : "";
  const clause = ref.clause && ref.clause !== "—" ? `, ${ref.clause}` : "";
  return `${ref.title}${edition}${clause} — ${STATUS_TEXT[ref.status]}`;
}

/** Short form for tight places (the PDF's figure table): title before its first comma, and the clause. */
export function shortCitation(id: string): string {
  const ref = BY_ID.get(id);
  if (!ref) return id;
  const title = ref.title.split(/,| – /)[0];
  const clause = ref.clause && ref.clause !== "—" ? ` ${ref.clause.split(" (")[0]}` : "";
  return `${title}${clause} (${STATUS_TEXT[ref.status]})`;
}

/** Anchor of a reference on the References page. */
export function referenceAnchor(id: string): string {
  return `ref-${id}`;
}

/**
 * Assessments stored by engine 1.x name an internal working file in their source text
 * ("(hazard-references §1c)"); a reader has no such file. Shown text drops those pointers.
 */
export function readableSource(source: string): string {
  return source
    .replace(/\s*\((?:[^()]*;\s*)?hazard-references[^()]*\)/g, (match) => {
      const inner = match.replace(/^\s*\(|\)$/g, "");
      const kept = inner
        .split(";")
        .map((part) => part.trim())
        .filter((part) => part && !part.includes("hazard-references"));
      return kept.length ? ` (${kept.join("; ")})` : "";
    })
    .replace(/,?\s*hazard-references\s*§\s*[\w.]+(?:,\s*§\s*[\w.]+)*/g, "")
    .replace(/\s*§\s*\d+[a-z]?\b/g, "")
    .trim();
}

type ReadableParts = {
  reasons: ReadonlyArray<{ source: string; meaning: string }>;
  flags: ReadonlyArray<{ source: string; message: string }>;
};

/**
 * An assessment as a reader gets it: the stored snapshot is never rewritten, but the pointers engine 1
 * put into its text ("(hazard-references §1c)") are dropped on the way out, as the screens do. Text
 * written by engine 2 has none and passes unchanged.
 */
export function readableAssessment<T extends ReadableParts>(assessment: T): T {
  return {
    ...assessment,
    reasons: assessment.reasons.map((r) => ({
      ...r,
      source: readableSource(r.source),
      meaning: readableSource(r.meaning),
    })),
    flags: assessment.flags.map((f) => ({
      ...f,
      source: readableSource(f.source),
      message: readableSource(f.message),
    })),
  };
}
