// Permit PDF render time: renders a one-page permit 50 times and prints the median and p95 in ms and the RSS growth across the renders
// (after a warm-up, see WARM).
//
// Run with `npx tsx scripts/bench/pdf.ts [renders]` (default 50; no database: the print snapshot is
// built here; `NODE_OPTIONS=--expose-gc npx tsx …` collects garbage before each RSS reading). The first
// render loads the fonts and warms the layout engine; it is timed separately and left out of the
// statistics, as a running server pays it once.
import { assessSetup, requiredControls, TIER_LABELS, type SetupInput } from "@/lib/hazard";
import { countPages, renderDocument } from "@/lib/pdf/render";
import type { PrintData } from "@/lib/pdf/types";

const RENDERS = Math.max(1, Number(process.argv[2] ?? 50) || 50);
// Renders before the memory reading starts. The first hundred or so grow the V8 heap's reserve and
// the layout engine's WebAssembly memory (yoga) to their working size, about +140 MB of RSS, which
// a running server pays once; after that the heap in use stays flat (no leak) and so does RSS.
// Measured 2026-12-02: RSS 122.8 → 262.7 MB over the first 100 renders, then 262.7 → 256.9 MB over
// the next 150, heap in use 39.8 → 39.9 MB. `--warm=N` sets it (default: half the renders, at most 100).
const WARM = Math.max(
  0,
  Number(process.argv.find((a) => a.startsWith("--warm="))?.slice(7) ?? Math.min(100, Math.floor(RENDERS / 2))),
);
// `--json`: one line of figures for scripts/bench/index.ts instead of the text below.
const JSON_OUT = process.argv.includes("--json");

// A tier 0 bench: a 5 cm sphere terminal at 100 kV (E = ½·C·V² ≈ 27.8 mJ), signed by no one: one page.
const setup: SetupInput = { sources: [{ id: "Sphere", kind: "sphere-terminal", radius_m: 0.05, voltage_V: 100e3 }] };
const assessment = assessSetup(setup);
const code = "QmVuY2htYXJrIHBlcm1pdCB2ZXJpZmljYXRpb24gY29kZQ";

const data: PrintData = {
  layoutVersion: 1,
  institution: {
    name: "Aldermere Institute of Technology",
    emergencyContacts: [
      { label: "Campus security (24 h)", phone: "+44 20 7946 0100" },
      { label: "Safety office", phone: "+44 20 7946 0142" },
    ],
    timeZone: "Europe/London",
  },
  permit: {
    number: "HV-2026-0001",
    state: "active",
    tier: assessment.tier,
    tierLabel: TIER_LABELS[assessment.tier],
    validFrom: "2026-03-01",
    validTo: "2026-03-31",
    validityReason: null,
    issuedAt: "2026-02-26T10:15:00.000Z",
    revokedOn: null,
    revokedReason: null,
    conditions: [],
    verificationCode: code,
    verificationUrl: `https://benchclear.aldermere.test/verify/${code}`,
  },
  holderName: "Imogen Tallis",
  event: {
    title: "Belt-charged sphere generator at the open day",
    kindLabel: "Outreach event",
    room: "B12",
    audienceLabel: "Members of the public",
    audienceSize: 60,
    firstDay: "2026-03-01",
    lastDay: "2026-03-31",
    responsible: "Imogen Tallis",
    operators: [{ name: "Owen Pryce", trained: true }],
  },
  apparatus: { name: "Belt-charged sphere generator", room: "B12", notes: "" },
  setup,
  assessment,
  controls: requiredControls(assessment.tier).map((c) => ({ text: c.text, confirmed: true, note: "" })),
  additionalControls: "",
  signatures: [],
};

function percentile(sorted: number[], p: number): number {
  const rank = Math.ceil((p / 100) * sorted.length) - 1;
  return sorted[Math.min(sorted.length - 1, Math.max(0, rank))];
}

const mb = (bytes: number) => (bytes / 1024 / 1024).toFixed(1);

async function main() {
  const warmStart = performance.now();
  const first = await renderDocument(data, "permit", "a4");
  const warm = performance.now() - warmStart;
  const pages = countPages(first);
  if (pages !== 1) throw new Error(`the benchmark permit has ${pages} pages; it must have one`);
  for (let i = 0; i < WARM; i++) await renderDocument(data, "permit", "a4");

  global.gc?.();
  const before = process.memoryUsage();
  const times: number[] = [];
  for (let i = 0; i < RENDERS; i++) {
    const start = performance.now();
    await renderDocument(data, "permit", "a4");
    times.push(performance.now() - start);
  }
  global.gc?.();
  const after = process.memoryUsage();
  times.sort((a, b) => a - b);

  if (JSON_OUT) {
    const r1 = (x: number) => Math.round(x * 10) / 10;
    console.log(
      JSON.stringify({
        renders: RENDERS,
        warmRenders: WARM,
        medianMs: r1(percentile(times, 50)),
        p95Ms: r1(percentile(times, 95)),
        rssGrowthMb: r1((after.rss - before.rss) / 1024 / 1024),
        heapGrowthMb: r1((after.heapUsed - before.heapUsed) / 1024 / 1024),
        heapTotalGrowthMb: r1((after.heapTotal - before.heapTotal) / 1024 / 1024),
        externalGrowthMb: r1((after.external - before.external) / 1024 / 1024),
      }),
    );
    return;
  }
  console.log(
    `one-page A4 permit, ${first.length} bytes, ${RENDERS} renders after a ${warm.toFixed(0)} ms first render and ${WARM} more to warm up`,
  );
  console.log(
    `median ${percentile(times, 50).toFixed(1)} ms · p95 ${percentile(times, 95).toFixed(1)} ms · max ${times[times.length - 1].toFixed(1)} ms`,
  );
  console.log(
    `RSS ${mb(before.rss)} MB → ${mb(after.rss)} MB (growth ${mb(after.rss - before.rss)} MB over ${RENDERS} renders)`,
  );
  // The JS heap after collection tells a leak (it keeps growing) from the allocator keeping pages.
  const collected = global.gc ? "" : " (run with --expose-gc for a collected reading)";
  console.log(`heap used ${mb(before.heapUsed)} MB → ${mb(after.heapUsed)} MB${collected}`);
  console.log(
    `heap reserved ${mb(before.heapTotal)} MB → ${mb(after.heapTotal)} MB · outside the heap (Buffers) ${mb(before.external)} MB → ${mb(after.external)} MB`,
  );
}

main().catch((error: unknown) => {
  console.error(error);
  process.exitCode = 1;
});
