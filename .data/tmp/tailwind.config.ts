import type { Config } from "tailwindcss";
import { TIER_COLOURS } from "./lib/tier-colours";

// Benchclear's theme. Linked from app/globals.css with `@config`; content scanning is set there with
// explicit `@source` folders, never here (the project root holds PostgreSQL's data folder).
//
// Tier colours come from lib/tier-colours.ts, the one definition the PDFs and e-mails use too. Each
// tier has tier-N (the swatch), tier-N-light (tint), tier-N-border and tier-N-text.
// A tier is never shown by colour alone: see app/_components/tier-badge.tsx.

const tiers = Object.fromEntries(
  Object.entries(TIER_COLOURS).map(([tier, c]) => [
    `tier-${tier}`,
    { DEFAULT: c.swatch, light: c.tint, border: c.border, text: c.text },
  ]),
);

// The interface accent: a deep ink blue, chosen because blue is not a tier colour.
const ink = {
  50: "#f2f6fb",
  100: "#e2eaf5",
  200: "#c6d5ea",
  300: "#9db5d9",
  400: "#6f8fc2",
  500: "#4d6fa9",
  600: "#3a578e",
  700: "#2f4774",
  800: "#283c60",
  900: "#223350",
  950: "#162035",
} as const;

const config: Config = {
  theme: {
    extend: {
      colors: { ...tiers, ink },
      fontFamily: {
        sans: ["var(--font-benchclear-sans)", "ui-sans-serif", "system-ui", "sans-serif"],
        mono: ["var(--font-benchclear-mono)", "ui-monospace", "SFMono-Regular", "Menlo", "monospace"],
      },
      maxWidth: {
        shell: "80rem",
      },
    },
  },
};

export default config;
