import type { Tier } from "@/lib/hazard/types";

// The hazard header of the permit and the bench card: a signal word used as ANSI Z535.4-2007
// (§4.14) and ISO 3864-2 define it, chosen by tier —
//   DANGER   "will result in death or serious injury"            tiers 3–4 (lethal shock, arc and blast)
//   WARNING  "could result in death or serious injury"           tier 2 (reflex injury)
//   CAUTION  "could result in minor or moderate injury"          tier 1 (a sting)
//   none     tier 0 is touch-safe: no hazard header at all.
// The panel colours are the standards' safety red, orange and yellow (ANSI Z535.1), not tier
// colours; the hex values approximate them for print (memory). The safety alert symbol (a triangle
// with an exclamation mark) precedes the word, as both standards do for personal-injury hazards.

export type SignalWord = "DANGER" | "WARNING" | "CAUTION";

export type SignalPanel = {
  word: SignalWord;
  /** What the word means, as the standard defines it. */
  meaning: string;
  /** Panel background and the ink of the word on it. */
  panel: string;
  ink: string;
};

export const SIGNAL_PANELS: Record<SignalWord, SignalPanel> = {
  DANGER: {
    word: "DANGER",
    meaning: "will result in death or serious injury",
    panel: "#c8102e",
    ink: "#ffffff",
  },
  WARNING: {
    word: "WARNING",
    meaning: "could result in death or serious injury",
    panel: "#ff8200",
    ink: "#000000",
  },
  CAUTION: {
    word: "CAUTION",
    meaning: "could result in minor or moderate injury",
    panel: "#ffd100",
    ink: "#000000",
  },
};

const BY_TIER: Record<Tier, SignalWord | null> = { 0: null, 1: "CAUTION", 2: "WARNING", 3: "DANGER", 4: "DANGER" };

/** The hazard header's message by tier: the hazard, what it does, and how to avoid it. */
const MESSAGES: Record<Tier, string | null> = {
  0: null,
  1: "High voltage, low energy. Touching it can give a painful shock or minor injury. Discharge it before anyone touches it.",
  2: "High voltage. Contact could kill or seriously injure, by the shock or by the reflex it causes. Only the named operators run it; de-energise and ground it before anyone touches it.",
  3: "High voltage and stored energy. Contact will kill or seriously injure. Keep outside the barrier while it is charged; de-energise and ground it before anyone touches it.",
  4: "High voltage and high stored energy. Contact, an arc or a blast will kill or seriously injure. Stay outside the barrier or enclosure while it is charged; de-energise and ground it before anyone touches it.",
};

/** The hazard header of a tier, or null for tier 0 (no header). */
export function hazardHeader(tier: Tier): (SignalPanel & { message: string }) | null {
  const word = BY_TIER[tier];
  const message = MESSAGES[tier];
  return word && message ? { ...SIGNAL_PANELS[word], message } : null;
}

/** The safety alert symbol in a 20 × 20 viewBox: a triangle (filled) and its exclamation mark. */
export const SAFETY_ALERT_SYMBOL = {
  viewBox: "0 0 20 20",
  triangle: "M10 1.6 19.2 18.2H0.8Z",
  bar: "M8.9 7h2.2l-0.45 6.2h-1.3Z",
  dot: "M10 14.3a1.2 1.2 0 1 0 0 2.4a1.2 1.2 0 1 0 0 -2.4Z",
} as const;
