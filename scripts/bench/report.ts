// The tables `npm run bench` prints and writes to docs/performance.md, with each budget of issue 15
// marked met or not.
import type { BenchResult } from "./index";

/** Issue 15: first-load JS of the application form, gzip kB (also a failure of the run, bench/index.ts). */
export const FORM_JS_BUDGET_KB = 190;

const num = (x: number) => (Number.isFinite(x) ? x.toLocaleString("en-GB") : "—");
const yes = (ok: boolean) => (ok ? "met" : "**not met**");

export function renderMarkdown(r: BenchResult): string {
  const out: string[] = [];
  out.push("# Measured speed");
  out.push("");
  out.push(
    `Written by \`npm run bench\` (scripts/bench/) on ${r.startedAt.slice(0, 16).replace("T", " ")} UTC: ` +
      `${r.machine.cpus} cores, load average ${r.machine.loadAverage.join(" / ")} at the start, Node ${r.machine.node}, ` +
      `loopback, ${r.connections} connections, ${r.durationS} s per route and side, app and baseline one after the other. ` +
      "The baseline is a bare `node:http` + `pg` server running the SQL statements the app ran for the same " +
      "request (captured from PostgreSQL's statement log), with no framework, session or rendering: the floor. " +
      "Ratio = app req/s ÷ baseline req/s. Latencies in ms. Numbers from a shared, busy machine move by tens of " +
      "per cent between runs; ratios from one run move less.",
  );
  for (const size of r.sizes) {
    out.push("");
    const c = size.dataset.counts;
    out.push(`## ${num(size.permits)} permits`);
    out.push("");
    out.push(
      `Data: ${num(c.permit)} permits, ${num(c.application)} applications, ${num(c.application_revision)} revisions, ` +
        `${num(c.decision)} decisions, ${num(c.app_user)} people, ${num(c.department)} departments, ` +
        `${num(c.apparatus)} apparatus; generated in ${size.dataset.seconds.toFixed(1)} s. ` +
        `Server resident memory: ${size.rssIdleMb} MB idle (after one request per route), ${size.rssAfterMb} MB after the load.`,
    );
    out.push("");
    out.push(
      "| route | app req/s | p50 | p95 | p99 | errors | CPU ms/req | baseline req/s | p50 | p95 | p99 | errors | CPU ms/req | ratio |",
    );
    out.push("| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |");
    const cpu = (x?: number) => (x === undefined || !Number.isFinite(x) ? "—" : String(x));
    for (const x of size.routes) {
      out.push(
        `| ${x.label} | ${num(x.app.rps)} | ${x.app.p50} | ${x.app.p95} | ${x.app.p99} | ${x.app.errors} | ${cpu(x.app.cpuMsPerRequest)} | ` +
          `${num(x.baseline.rps)} | ${x.baseline.p50} | ${x.baseline.p95} | ${x.baseline.p99} | ${x.baseline.errors} | ${cpu(x.baseline.cpuMsPerRequest)} | ${x.ratio} |`,
      );
    }
    out.push("");
    out.push(
      "CPU ms/req: the server's CPU time (user + system, its process tree, from /proc) over the run divided by the requests it answered; the machine's other load delays requests but does not make them cost more, so this column moves less than req/s on a busy machine.",
    );
    const scans = size.plans.filter((p) => p.seqScans.length);
    out.push("");
    out.push(
      `Plans: ${size.plans.length} SELECT statements of the lists, queue, dashboard, search and status page explained ` +
        `(ANALYZE, BUFFERS); ${scans.length ? `sequential scans of large tables: ${scans.map((s) => `${s.route} → ${s.seqScans.map((t) => t.table).join(", ")}`).join("; ")}` : "no sequential scan of a table above 10 000 rows"}. ` +
        `Slowest: ${[...size.plans]
          .sort((a, b) => b.ms - a.ms)
          .slice(0, 3)
          .map((p) => `${p.route} ${p.ms} ms`)
          .join(", ")}.`,
    );
  }

  const first = r.sizes[0];
  const last = r.sizes.at(-1);
  if (first && last && first !== last) {
    out.push("");
    out.push(`## p95 growth from ${num(first.permits)} to ${num(last.permits)} permits (app)`);
    out.push("");
    out.push("| route | p95 at first size | p95 at last size | growth | budget ≤ 1.2 × (lists) |");
    out.push("| --- | ---: | ---: | ---: | --- |");
    for (const a of first.routes) {
      const b = last.routes.find((x) => x.name === a.name);
      if (!b) continue;
      const growth = a.app.p95 > 0 ? Math.round((b.app.p95 / a.app.p95) * 100) / 100 : NaN;
      out.push(`| ${a.label} | ${a.app.p95} | ${b.app.p95} | ${growth} × | ${a.list ? yes(growth <= 1.2) : "—"} |`);
    }
  }

  out.push("");
  out.push("## Budgets");
  out.push("");
  out.push("| budget | measured | |");
  out.push("| --- | --- | --- |");
  if (last) {
    for (const x of last.routes.filter((y) =>
      ["permits", "permits-tier", "permits-page400", "queue"].includes(y.name),
    )) {
      out.push(
        `| ${x.label} at ${num(last.permits)} permits ≥ 0.5 × baseline | ${x.ratio} × | ${yes(x.ratio >= 0.5)} |`,
      );
    }
    const status = last.routes.find((y) => y.name === "status");
    if (status) out.push(`| status page ≥ 0.25 × baseline | ${status.ratio} × | ${yes(status.ratio >= 0.25)} |`);
    const idle = Math.max(...r.sizes.map((s) => s.rssIdleMb));
    out.push(`| resident memory idle ≤ 300 MB | ${idle} MB (largest of the sizes) | ${yes(idle <= 300)} |`);
  }
  if (r.js) {
    const by = (route: string) => r.js!.routes.find((x) => x.route === route)?.kb ?? NaN;
    out.push(
      `| status page JS ≤ runtime (${r.js.runtimeKb} kB) | ${by("/verify/[code]")} kB | ${yes(by("/verify/[code]") <= r.js.runtimeKb + 0.5)} |`,
    );
    out.push(`| sign-in JS ≤ runtime + 10 kB | ${by("/sign-in")} kB | ${yes(by("/sign-in") <= r.js.runtimeKb + 10)} |`);
    out.push(
      `| application form JS ≤ ${FORM_JS_BUDGET_KB} kB | ${by("/applications/new")} kB | ${yes(by("/applications/new") <= FORM_JS_BUDGET_KB)} |`,
    );
  }
  if (r.pdf) {
    out.push(
      `| PDF: no growth over ${r.pdf.renders} renders after a collection (≤ 20 MB) | ${r.pdf.rssGrowthMb} MB RSS, ${r.pdf.heapGrowthMb} MB heap | ${yes(r.pdf.rssGrowthMb <= 20)} |`,
    );
  }

  if (r.js) {
    out.push("");
    out.push("## First-load JavaScript (gzip, module scripts the page names)");
    out.push("");
    out.push(
      `Framework runtime (what a page with no client components of its own loads: the not-found page): ${r.js.runtimeKb} kB` +
        (r.js.rootMainKb ? `, of which the build's root main files ${r.js.rootMainKb} kB.` : "."),
    );
    out.push("");
    out.push("| route | kB gzip | files |");
    out.push("| --- | ---: | ---: |");
    for (const x of r.js.routes) out.push(`| \`${x.route}\` | ${x.kb} | ${x.files} |`);
  }
  if (r.pdf) {
    out.push("");
    out.push("## PDF render");
    out.push("");
    out.push(
      `${r.pdf.renders} renders of a one-page permit after ${1 + (r.pdf.warmRenders ?? 0)} warm-up renders and a collection: median ${r.pdf.medianMs} ms, ` +
        `p95 ${r.pdf.p95Ms} ms; resident memory grew ${r.pdf.rssGrowthMb} MB and the collected heap ${r.pdf.heapGrowthMb} MB. ` +
        "The warm-up grows the V8 heap's reserve and the layout engine's WebAssembly memory to their working size once " +
        "(scripts/bench/pdf.ts); growth after it would be a leak.",
    );
  }
  if (r.failures.length) {
    out.push("");
    out.push("## The run failed");
    out.push("");
    for (const f of r.failures) out.push(`- ${f}`);
  }
  out.push("");
  return out.join("\n");
}
