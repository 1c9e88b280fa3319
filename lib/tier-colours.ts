import type { Tier } from "@/lib/hazard/types";

// Benchclear's tier colours, the one definition: 0 slate, 1 teal, 2 amber, 3 crimson, 4 violet. The
// screen's Tailwind classes (bg-tier-N, bg-tier-N-light, border-tier-N-border, text-tier-N-text,
// through lib/tier-colours.tailwind.ts), the printed permit and bench card (lib/pdf) and the e-mails
// (emails/components.tsx) all take them from here. Per tier:
//   swatch  solid marks and bars (≥ 3:1 on white and on the tint; not for text)
//   tint    a background
//   border  a border on the tint
//   text    text on white or on the tint (contrast ≥ 7:1 on the tint)
// A tier is never shown by colour alone: the glyph (lib/tier-glyph.ts) and the words go with it.

export type TierColours = { swatch: string; tint: string; border: string; text: string };

export const TIER_COLOURS: Record<Tier, TierColours> = {
  0: { swatch: "#64748b", tint: "#f1f5f9", border: "#cbd5e1", text: "#1e293b" },
  1: { swatch: "#0f8f84", tint: "#effcf9", border: "#99e2d6", text: "#0d4a45" },
  2: { swatch: "#c47a02", tint: "#fff8e6", border: "#f5cf7a", text: "#6e3a06" },
  3: { swatch: "#b8173a", tint: "#fff1f3", border: "#f5a8b8", text: "#7a0f2a" },
  4: { swatch: "#7440d6", tint: "#f6f2ff", border: "#cbb8f5", text: "#42198a" },
};
