import localFont from "next/font/local";

// Shipped fonts only: the build has no internet, so never next/font/google.
// Benchclear Sans and Benchclear Mono are IBM Plex Sans and IBM Plex Mono (SIL OFL 1.1) subset to the
// glyphs Benchclear shows and renamed as the licence asks of modified versions; see README.md here.

export const benchclearSans = localFont({
  src: [
    { path: "./benchclear-sans-400.woff2", weight: "400", style: "normal" },
    { path: "./benchclear-sans-500.woff2", weight: "500", style: "normal" },
    { path: "./benchclear-sans-600.woff2", weight: "600", style: "normal" },
  ],
  variable: "--font-benchclear-sans",
  display: "swap",
  fallback: ["ui-sans-serif", "system-ui", "sans-serif"],
});

export const benchclearMono = localFont({
  src: [
    { path: "./benchclear-mono-400.woff2", weight: "400", style: "normal" },
    { path: "./benchclear-mono-500.woff2", weight: "500", style: "normal" },
  ],
  variable: "--font-benchclear-mono",
  display: "swap",
  fallback: ["ui-monospace", "monospace"],
});

/** Class names that expose both font variables; put them on <html>. */
export const fontVariables = `${benchclearSans.variable} ${benchclearMono.variable}`;
