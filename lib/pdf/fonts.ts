import path from "node:path";
import { Font } from "@react-pdf/renderer";

// The permit's fonts: Benchclear Sans and Mono as TTF (react-pdf is slow with WOFF), registered once
// per process. Paths are resolved from the project root, where `next start` and the scripts run.

export const SANS = "Benchclear Sans";
export const MONO = "Benchclear Mono";

let registered = false;

export function registerFonts(): void {
  if (registered) return;
  const dir = path.join(process.cwd(), "lib/pdf/fonts");
  Font.register({
    family: SANS,
    fonts: [
      { src: path.join(dir, "BenchclearSans-Regular.ttf"), fontWeight: 400 },
      { src: path.join(dir, "BenchclearSans-Bold.ttf"), fontWeight: 700 },
    ],
  });
  Font.register({ family: MONO, src: path.join(dir, "BenchclearMono-Regular.ttf") });
  // No hyphenation: a split figure or permit number ("HV-2026-00-\n03") misreads at the bench, and
  // text read back by tools must match what was written.
  Font.registerHyphenationCallback((word) => [word]);
  registered = true;
}
