// The note every result screen, permit, bench card and e-mail carries: what Benchclear's figures are
// and who decides. It is a note, titled "About these figures" beside an information symbol — not a
// hazard sign: the signal words DANGER, WARNING and CAUTION keep the meanings ANSI Z535.4 and
// ISO 3864-2 give them, on the hazard header of the permit and bench card (lib/signal-word.ts).
// Keep the three points together (an estimate; codes, rules and a qualified person govern;
// de-energise and ground).

export const ABOUT_FIGURES_TITLE = "About these figures";

export const ABOUT_FIGURES_POINTS = [
  "The figures are an engineering estimate.",
  "Local codes, your institution’s rules and a qualified person’s judgement govern.",
  "De-energise and ground a set-up before anyone touches it.",
] as const;

export const ABOUT_FIGURES_TEXT = ABOUT_FIGURES_POINTS.join(" ");

/**
 * The information symbol beside the title: a lower-case "i" in a circle, in a 20 × 20 viewBox,
 * drawn by the screen, the PDFs and the e-mails from these paths. ring and stem are strokes
 * (width `stroke`), dot is filled.
 */
export const INFO_SYMBOL = {
  viewBox: "0 0 20 20",
  ring: "M2.5 10a7.5 7.5 0 1 0 15 0a7.5 7.5 0 1 0 -15 0Z",
  stem: "M10 9v5",
  dot: "M10 5.6a1.05 1.05 0 1 0 0 2.1a1.05 1.05 0 1 0 0 -2.1Z",
  stroke: 1.6,
} as const;
