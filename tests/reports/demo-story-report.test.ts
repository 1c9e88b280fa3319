// The committee report and the live sheet over the demo story (issue 18, items 2 and 6): on the data a
// fresh `npm start` puts in, both are non-empty, and their figures are the ones the SQL written here
// finds (not the report's own queries). The story goes into a database of its own (made, migrated and
// dropped here; filled by tests/support/demo-story-report.ts in a child process), as the rules
// preview's demo-story test does: the shared test database holds other tests' rows.
import { spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { sql } from "drizzle-orm";
import { Pool } from "pg";
import { describe, expect, it } from "vitest";
import type { LiveSheet } from "@/lib/permits/live";
import type { Report } from "@/lib/reports/queries";
import { ownerDb, requireDatabase, uniq } from "../support/db";

requireDatabase();

function run(command: string, args: string[], env: NodeJS.ProcessEnv): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, { env, stdio: ["ignore", "pipe", "pipe"] });
    let out = "";
    let err = "";
    child.stdout.on("data", (c) => (out += c));
    child.stderr.on("data", (c) => (err += c));
    child.on("error", reject);
    child.on("close", (code) => (code === 0 ? resolve(out) : reject(new Error(`${args.join(" ")}: ${code}\n${err}`))));
  });
}

describe("the committee report and the live sheet over the demo story", () => {
  it("are non-empty and agree with SQL written here", { timeout: 240_000 }, async () => {
    const name = `${process.env.TEST_DB_NAME ?? "benchclear_test"}_report_${uniq("d").slice(2)}`;
    const url = new URL(process.env.DATABASE_OWNER_URL ?? process.env.DATABASE_URL!);
    url.pathname = `/${name}`;
    await ownerDb().execute(sql.raw(`CREATE DATABASE ${name}`));
    let answer: { report: Report; live: LiveSheet };
    let issued: { month: string; tier: number; n: number }[];
    let active: { tier: number; n: number }[];
    let incidents: { month: string; kind: string; injuries: boolean; n: number }[];
    let liveNumbers: string[];
    try {
      const env = {
        ...process.env,
        DATABASE_URL: url.toString(),
        DATABASE_OWNER_URL: url.toString(),
        STORAGE_DIR: path.join(".data", `uploads-${name}`),
        LOCAL_INBOX_DIR: path.join(".data", `mail-${name}`),
      };
      const tsx = path.resolve("node_modules/.bin/tsx");
      await run(tsx, ["scripts/migrate.ts"], env);
      const out = await run(tsx, ["tests/support/demo-story-report.ts"], env);
      answer = JSON.parse(/^REPORT (.*)$/m.exec(out)![1]) as typeof answer;
      const { from, to, today, timeZone } = answer.report.filters;
      const pool = new Pool({ connectionString: url.toString(), max: 1 });
      try {
        const q = async <T>(text: string, values: unknown[]) => (await pool.query(text, values)).rows as T[];
        issued = await q(
          `SELECT to_char(date_trunc('month', issued_at AT TIME ZONE $1), 'YYYY-MM') AS month, tier, count(*)::int AS n
           FROM permit WHERE issued_at AT TIME ZONE $1 >= $2::timestamp AND issued_at AT TIME ZONE $1 < $3::timestamp + interval '1 day'
           GROUP BY 1, 2`,
          [timeZone, from, to],
        );
        active = await q(
          `SELECT tier, count(*)::int AS n FROM permit WHERE state = 'active' AND valid_to >= $1::date GROUP BY tier`,
          [today],
        );
        incidents = await q(
          `SELECT to_char(date_trunc('month', occurred_at AT TIME ZONE $1), 'YYYY-MM') AS month, kind, injuries, count(*)::int AS n
           FROM incident WHERE occurred_at AT TIME ZONE $1 >= $2::timestamp AND occurred_at AT TIME ZONE $1 < $3::timestamp + interval '1 day'
           GROUP BY 1, 2, 3`,
          [timeZone, from, to],
        );
        liveNumbers = (
          await q<{ number: string }>(
            `SELECT number FROM permit WHERE state = 'active' AND valid_from <= $1::date AND valid_to >= $1::date`,
            [today],
          )
        ).map((r) => r.number);
      } finally {
        await pool.end();
      }
    } finally {
      await ownerDb().execute(sql.raw(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`));
      for (const dir of [`uploads-${name}`, `mail-${name}`])
        fs.rmSync(path.join(".data", dir), { recursive: true, force: true });
    }
    const { report, live } = answer;

    // Permits issued per month by tier: every month the SQL counts, and no other.
    const issuedTotal = report.issued.reduce((a, m) => a + m.total, 0);
    expect(issuedTotal).toBeGreaterThan(0);
    expect(issuedTotal).toBe(issued.reduce((a, r) => a + r.n, 0));
    for (const m of report.issued)
      for (const t of [0, 1, 2, 3, 4] as const)
        expect(m.tiers[t], `${m.month} tier ${t}`).toBe(
          issued.find((r) => r.month === m.month && r.tier === t)?.n ?? 0,
        );

    // Active permits by tier (summed over the departments).
    for (const t of [0, 1, 2, 3, 4] as const)
      expect(
        report.active.reduce((a, d) => a + d.tiers[t], 0),
        `active tier ${t}`,
      ).toBe(active.find((r) => r.tier === t)?.n ?? 0);

    // Incidents per month: the story's two reports (scripts/demo-data.ts demoIncidents), a near miss
    // and an incident in which someone was hurt.
    const sum = (keep: (r: (typeof incidents)[number]) => boolean, month?: string) =>
      incidents.filter((r) => (!month || r.month === month) && keep(r)).reduce((a, r) => a + r.n, 0);
    for (const m of report.incidents) {
      expect(m.incidents, m.month).toBe(sum((r) => r.kind === "incident", m.month));
      expect(m.nearMisses, m.month).toBe(sum((r) => r.kind === "near_miss", m.month));
      expect(m.injuries, m.month).toBe(sum((r) => r.injuries, m.month));
    }
    expect(report.incidents.reduce((a, m) => a + m.total, 0)).toBe(2);
    expect(report.incidents.reduce((a, m) => a + m.injuries, 0)).toBe(1);

    // The live sheet: exactly the permits active today, each with the institution's emergency phone,
    // the story's three set-ups live today in the Faraday Building and Kelvin Hall among them.
    expect(live.rows.map((r) => r.number).sort()).toEqual([...liveNumbers].sort());
    expect(live.rows.length).toBeGreaterThanOrEqual(3);
    for (const row of live.rows) expect(row.emergencyPhone, row.number).toBeTruthy();
    expect(
      live.rows
        .filter((r) => r.building === "Faraday Building")
        .map((r) => r.title)
        .sort(),
    ).toEqual(["Gas discharge practical", "Long sparks for the evening lecture"]);
    expect(live.rows.filter((r) => r.building === "Kelvin Hall").map((r) => r.title)).toEqual([
      "Sphere generator at the open laboratory",
    ]);
  });
});
