import localFont from "next/font/local";

// Shipped fonts only: the build has no internet, so never next/font/google.
// Arcwarden Sans and Arcwarden Mono are IBM Plex Sans and IBM Plex Mono (SIL OFL 1.1) subset to the
// glyphs Arcwarden shows and renamed as the licence asks of modified versions; see README.md here.

export const arcwardenSans = localFont({
  src: [
    { path: "./arcwarden-sans-400.woff2", weight: "400", style: "normal" },
    { path: "./arcwarden-sans-500.woff2", weight: "500", style: "normal" },
    { path: "./arcwarden-sans-600.woff2", weight: "600", style: "normal" },
  ],
  variable: "--font-arcwarden-sans",
  display: "swap",
  fallback: ["ui-sans-serif", "system-ui", "sans-serif"],
});

export const arcwardenMono = localFont({
  src: [
    { path: "./arcwarden-mono-400.woff2", weight: "400", style: "normal" },
    { path: "./arcwarden-mono-500.woff2", weight: "500", style: "normal" },
  ],
  variable: "--font-arcwarden-mono",
  display: "swap",
  fallback: ["ui-monospace", "monospace"],
});

/** Class names that expose both font variables; put them on <html>. */
export const fontVariables = `${arcwardenSans.variable} ${arcwardenMono.variable}`;
