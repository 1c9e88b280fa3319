// How a tier looks, in one place for every screen. The hazard engine owns the tiers, their labels
// and thresholds; this file only adds classes. Class names are written out in full so Tailwind's
// scanner finds them.

import { TIER_LABELS } from "@/lib/hazard/rules";
import type { Tier } from "@/lib/hazard/types";

export { TIER_LABELS, type Tier };

export const TIERS = [0, 1, 2, 3, 4] as const satisfies readonly Tier[];

// glyph: the swatch as currentColor, for the tier glyph (app/_components/tier-glyph.tsx).
type TierClasses = { swatch: string; tint: string; border: string; text: string; glyph: string };

export const TIER_CLASSES: Record<Tier, TierClasses> = {
  0: {
    swatch: "bg-tier-0",
    tint: "bg-tier-0-light",
    border: "border-tier-0-border",
    text: "text-tier-0-text",
    glyph: "text-tier-0",
  },
  1: {
    swatch: "bg-tier-1",
    tint: "bg-tier-1-light",
    border: "border-tier-1-border",
    text: "text-tier-1-text",
    glyph: "text-tier-1",
  },
  2: {
    swatch: "bg-tier-2",
    tint: "bg-tier-2-light",
    border: "border-tier-2-border",
    text: "text-tier-2-text",
    glyph: "text-tier-2",
  },
  3: {
    swatch: "bg-tier-3",
    tint: "bg-tier-3-light",
    border: "border-tier-3-border",
    text: "text-tier-3-text",
    glyph: "text-tier-3",
  },
  4: {
    swatch: "bg-tier-4",
    tint: "bg-tier-4-light",
    border: "border-tier-4-border",
    text: "text-tier-4-text",
    glyph: "text-tier-4",
  },
};

/** "Tier 2 · Reflex injury": the words that must accompany every tier colour. */
export function tierText(tier: Tier): string {
  return `Tier ${tier} · ${TIER_LABELS[tier]}`;
}

export function isTier(value: unknown): value is Tier {
  return typeof value === "number" && (TIERS as readonly number[]).includes(value);
}
