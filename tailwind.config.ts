import type { Config } from "tailwindcss";

// Benchclear's theme. Linked from app/globals.css with `@config`; content scanning is set there with
// explicit `@source` folders, never here (the project root holds PostgreSQL's data folder).
//
// Tier colours are Benchclear's own: 0 slate, 1 teal, 2 amber, 3 crimson, 4 violet. Each tier has
//   tier-N        the swatch for solid marks and bars (≥ 3:1 on white and on the tint; not for text)
//   tier-N-light  a tint for backgrounds
//   tier-N-border a border on the tint
//   tier-N-text   text on white or on the tint (contrast ≥ 7:1 on tier-N-light)
// A tier is never shown by colour alone: see app/_components/tier-badge.tsx.

const tiers = {
  "tier-0": { DEFAULT: "#64748b", light: "#f1f5f9", border: "#cbd5e1", text: "#1e293b" },
  "tier-1": { DEFAULT: "#0f8f84", light: "#effcf9", border: "#99e2d6", text: "#0d4a45" },
  "tier-2": { DEFAULT: "#c47a02", light: "#fff8e6", border: "#f5cf7a", text: "#6e3a06" },
  "tier-3": { DEFAULT: "#b8173a", light: "#fff1f3", border: "#f5a8b8", text: "#7a0f2a" },
  "tier-4": { DEFAULT: "#7440d6", light: "#f6f2ff", border: "#cbb8f5", text: "#42198a" },
} as const;

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
