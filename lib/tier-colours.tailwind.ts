import plugin from "tailwindcss/plugin";
import { TIER_COLOURS } from "./tier-colours";

// The tier colours as Tailwind theme colours (bg-tier-N, bg-tier-N-light, border-tier-N-border,
// text-tier-N-text), loaded by app/globals.css with `@plugin`, so the screen takes them from the same
// definition as the PDFs and e-mails. The rest of the theme is CSS (`@theme` in app/globals.css).
// Relative import: Tailwind loads this file without the project's path aliases.

const colors = Object.fromEntries(
  Object.entries(TIER_COLOURS).map(([tier, c]) => [
    `tier-${tier}`,
    { DEFAULT: c.swatch, light: c.tint, border: c.border, text: c.text },
  ]),
);

export default plugin(() => {}, { theme: { extend: { colors } } });
