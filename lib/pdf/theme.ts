import type { PermitState } from "@/db/schema/permits";
import type { Tier } from "@/lib/hazard";

// Colours of the printed permit. Tier colours are the app's own (tailwind.config.ts: swatch, tint,
// border, text); the permit states use the same families as the app's state badges, darkened for
// print. A colour never stands alone: every tier and state is also printed in words.

export type TierColours = { swatch: string; tint: string; border: string; text: string };

export const TIER_COLOURS: Record<Tier, TierColours> = {
  0: { swatch: "#64748b", tint: "#f1f5f9", border: "#cbd5e1", text: "#1e293b" },
  1: { swatch: "#0f8f84", tint: "#effcf9", border: "#99e2d6", text: "#0d4a45" },
  2: { swatch: "#c47a02", tint: "#fff8e6", border: "#f5cf7a", text: "#6e3a06" },
  3: { swatch: "#b8173a", tint: "#fff1f3", border: "#f5a8b8", text: "#7a0f2a" },
  4: { swatch: "#7440d6", tint: "#f6f2ff", border: "#cbb8f5", text: "#42198a" },
};

export const STATE_LOOK: Record<PermitState, { label: string; colour: string; meaning: string }> = {
  active: { label: "ACTIVE", colour: "#047857", meaning: "This set-up may be run as described." },
  expired: { label: "EXPIRED", colour: "#9a3412", meaning: "The validity window has ended: do not run this set-up." },
  revoked: { label: "REVOKED", colour: "#b91c1c", meaning: "This permit was withdrawn: do not run this set-up." },
};

export const INK = {
  text: "#1c1917",
  body: "#292524",
  muted: "#57534e",
  faint: "#78716c",
  rule: "#d6d3d1",
  hairline: "#e7e5e4",
  panel: "#f5f5f4",
  accent: "#223350",
} as const;
