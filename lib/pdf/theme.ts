import type { PermitState } from "@/db/schema/permits";

// Colours of the printed permit. Tier colours are the app's own (lib/tier-colours.ts); the permit
// states use the same families as the app's state badges, darkened for print. A colour never stands
// alone: every tier and state is also printed in words.

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
