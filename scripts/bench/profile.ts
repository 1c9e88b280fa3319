// Where the server's time goes: a summary of the V8 CPU profile that `npm run bench -- --profile`
// has the app server write (node --cpu-prof). Self time is grouped by package (the folder under
// node_modules, or "app" for the build's own chunks, "node" for Node.js internals) and by function,
// so the first thing to change is the biggest row, not a guess.
import fs from "node:fs";
import path from "node:path";

type ProfileNode = {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  hitCount?: number;
  children?: number[];
};
type CpuProfile = { nodes: ProfileNode[]; samples: number[]; timeDeltas: number[]; startTime: number; endTime: number };

export type ProfileRow = { name: string; ms: number; share: number };
export type ProfileSummary = {
  file: string;
  totalMs: number;
  idleMs: number;
  byPackage: ProfileRow[];
  byFunction: ProfileRow[];
};

/** The package a script URL belongs to. */
export function packageOf(url: string): string {
  if (!url) return "(native)";
  if (url.startsWith("node:")) return "node";
  const inModules = url.lastIndexOf("node_modules/");
  if (inModules >= 0) {
    const rest = url.slice(inModules + "node_modules/".length).split("/");
    return rest[0].startsWith("@") ? `${rest[0]}/${rest[1]}` : rest[0];
  }
  if (url.includes("/.next/")) return "app (build chunks)";
  return path.basename(url);
}

export function summarizeProfile(file: string, top = 20): ProfileSummary {
  const profile = JSON.parse(fs.readFileSync(file, "utf8")) as CpuProfile;
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  // Self time per node from the samples and the time between them (µs).
  const selfUs = new Map<number, number>();
  profile.samples.forEach((id, i) => selfUs.set(id, (selfUs.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0)));
  const pkg = new Map<string, number>();
  const fn = new Map<string, number>();
  let total = 0;
  let idle = 0;
  for (const [id, us] of selfUs) {
    const node = byId.get(id);
    if (!node) continue;
    total += us;
    const name = node.callFrame.functionName;
    if (name === "(idle)" || name === "(program)" || name === "(garbage collector)") {
      if (name === "(idle)") idle += us;
      else pkg.set(name, (pkg.get(name) ?? 0) + us);
      continue;
    }
    const owner = packageOf(node.callFrame.url);
    pkg.set(owner, (pkg.get(owner) ?? 0) + us);
    const key = `${name || "(anonymous)"} · ${owner}${node.callFrame.url && !owner.startsWith("node") ? `:${node.callFrame.lineNumber + 1}` : ""}`;
    fn.set(key, (fn.get(key) ?? 0) + us);
  }
  const busy = Math.max(1, total - idle);
  const rows = (m: Map<string, number>) =>
    [...m.entries()]
      .sort((a, b) => b[1] - a[1])
      .slice(0, top)
      .map(([name, us]) => ({ name, ms: Math.round(us / 1000), share: Math.round((us / busy) * 1000) / 10 }));
  return {
    file,
    totalMs: Math.round(total / 1000),
    idleMs: Math.round(idle / 1000),
    byPackage: rows(pkg),
    byFunction: rows(fn),
  };
}

/** The newest .cpuprofile in a folder, or null. */
export function newestProfile(dir: string): string | null {
  if (!fs.existsSync(dir)) return null;
  const files = fs
    .readdirSync(dir)
    .filter((f) => f.endsWith(".cpuprofile"))
    .map((f) => path.join(dir, f))
    .sort((a, b) => fs.statSync(b).mtimeMs - fs.statSync(a).mtimeMs);
  return files[0] ?? null;
}

export function profileMarkdown(s: ProfileSummary): string {
  const table = (title: string, rows: ProfileRow[]) =>
    [
      `| ${title} | self ms | share of busy time |`,
      "| --- | ---: | ---: |",
      ...rows.map((r) => `| ${r.name.replace(/\|/g, "\\|")} | ${r.ms} | ${r.share} % |`),
    ].join("\n");
  return [
    `CPU profile of the app server over the whole run: ${s.totalMs} ms sampled, ${s.idleMs} ms idle.`,
    "",
    table("package", s.byPackage),
    "",
    table("function", s.byFunction),
  ].join("\n");
}

// `tsx scripts/bench/profile.ts <file or folder>`: print the summary of one profile.
if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(import.meta.filename ?? "")) {
  const target = process.argv[2] ?? path.join(process.cwd(), ".data/bench/profile");
  const file = fs.existsSync(target) && fs.statSync(target).isDirectory() ? newestProfile(target) : target;
  if (!file) {
    console.error(`No .cpuprofile in ${target}: run npm run bench -- --profile first.`);
    process.exit(2);
  }
  console.log(profileMarkdown(summarizeProfile(file, Number(process.argv[3] ?? 25))));
}
