// Rules preview over the demo story (issue 18, item 3): raising a threshold lists exactly the demo's
// open applications and active permits whose tier would change. The expected records are named here
// by their titles, worked out by hand from the story's set-ups (scripts/demo-story.ts) and the
// default thresholds' published values, not by asking the engine.
//
// The story goes into a database of its own (made, migrated and dropped here; the demo data as
// `npm start` puts it in, run by tests/support/demo-story-preview.ts in a child process): the
// shared test database holds other tests' training requirements, which the story's approvals (they
// name their operators) would meet, and other tests' records, which a preview lists too.
import { spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { ownerDb, requireDatabase, uniq } from "../support/db";

requireDatabase();

type Listed = [title: string, tierNow: number, tierNew: number][];
type Moves = { applications: Listed; permits: Listed };
type Answer = { titles: string[]; rulesVersion: string; rulesVersionAfter: string } & Record<string, Moves>;

function run(command: string, args: string[], env: NodeJS.ProcessEnv, input = ""): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, { env, stdio: ["pipe", "pipe", "pipe"] });
    let out = "";
    let err = "";
    child.stdout.on("data", (c) => (out += c));
    child.stderr.on("data", (c) => (err += c));
    child.on("error", reject);
    child.on("close", (code) => (code === 0 ? resolve(out) : reject(new Error(`${args.join(" ")}: ${code}\n${err}`))));
    child.stdin.end(input);
  });
}

describe("the rules preview over the demo story", () => {
  it("lists exactly the demo records a raised threshold moves, and adopts nothing", { timeout: 240_000 }, async () => {
    const name = `${process.env.TEST_DB_NAME ?? "benchclear_test"}_story_${uniq("d").slice(2)}`;
    const url = new URL(process.env.DATABASE_OWNER_URL ?? process.env.DATABASE_URL!);
    url.pathname = `/${name}`;
    await ownerDb().execute(sql.raw(`CREATE DATABASE ${name}`));
    let answer: Answer;
    try {
      const env = {
        ...process.env,
        // The demo data is put in as the owner, as `npm start` does (it re-dates approvals).
        DATABASE_URL: url.toString(),
        DATABASE_OWNER_URL: url.toString(),
        STORAGE_DIR: path.join(".data", `uploads-${name}`),
        LOCAL_INBOX_DIR: path.join(".data", `mail-${name}`),
      };
      const tsx = path.resolve("node_modules/.bin/tsx");
      await run(tsx, ["scripts/migrate.ts"], env);
      const proposals = [
        { name: "arc", changes: [{ path: ["arc", "energy"], value: 20_000 }] },
        {
          name: "lethal",
          changes: [
            { path: ["lethal", "energy"], value: 20 },
            { path: ["impulse", "specificEnergy"], value: 0.1 },
          ],
        },
        { name: "none", changes: [] },
      ];
      const out = await run(tsx, ["tests/support/demo-story-preview.ts"], env, JSON.stringify(proposals));
      answer = JSON.parse(/^PREVIEW (.*)$/m.exec(out)![1]) as Answer;
    } finally {
      await ownerDb().execute(sql.raw(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`));
      for (const dir of [`uploads-${name}`, `mail-${name}`])
        fs.rmSync(path.join(".data", dir), { recursive: true, force: true });
    }

    // The story is there under these titles, with the default rules in force.
    for (const title of [
      "Discharge tubes for first-year optics", // tier 1, submitted
      "Long sparks for the electrostatics lecture", // tier 3, in review
      "Sphere generator at the science fair", // tier 2, returned
      "Influence machine for the school visit", // tier 0, active permit
      "Discharge tubes in the teaching lab", // tier 1, active permit
      "Jar bank for the spring lecture series", // tier 3, active permit
      "Pulsed bank research runs", // tier 4, active permit ending this week
      "Can-crushing demonstration in the lecture theatre", // tier 4, rejected: not open
      "Jar bank for the autumn lecture series", // tier 3, permit expired: not active
    ])
      expect(answer.titles, title).toContain(title);
    expect(answer.rulesVersion).toBe("benchclear-default-2");

    // The rules in force, proposed again: nothing moves.
    expect(answer.none).toEqual({ applications: [], permits: [] });

    // Arc flash from 10 kJ to 20 kJ. Worked by hand: the pulsed bank is 8 × 100 µF in parallel at
    // 5 kV, ½·C·V² = ½ × 800 µF × (5 kV)² = 10 kJ: at the arc-flash threshold of LBNL ESM 2.2.13
    // (capacitors at 100 V or more and 10 kJ or more: tier 4); under 20 kJ it is below, and its 10 kJ
    // is still far above the lethal 10 J (tier 3). Every other demo set-up stores well under 1 kJ.
    // The rejected can crusher uses the same bank but is not open, so it is not listed.
    expect(answer.arc).toEqual({ applications: [], permits: [["Pulsed bank research runs", 4, 3]] });

    // Lethal energy from 10 J to 20 J and the impulse's specific energy from 0.0025 to 0.1 A²s. The
    // jar bank: 8 × 5 nF in parallel at 25 kV, ½ × 40 nF × (25 kV)² = 12.5 J, over the lethal 10 J of
    // LBNL ESM 2.2.13; through the 500 Ω body of IEC 60479-1 its ∫i²dt is E/R = 12.5 J / 500 Ω =
    // 0.025 A²s, over the 0.0025 A²s of IEC 60479-2. Under 20 J and 0.1 A²s both fall below, and
    // 12.5 J stays above the 0.25 J heavy-shock energy (tier 2). Its application in review and its
    // active spring permit move; the expired autumn permit is not listed. The pulsed bank's 10 kJ
    // stays lethal (and tier 4 by arc flash); the sphere generator (about 33 pF at some 200 kV, under
    // 1 J) was tier 2 already.
    // The live-sheet part of the story (scripts/demo-live-report.ts) adds a permit active today over the
    // same jar bank set-up (8 × 5 nF at 25 kV: 12.5 J), "Long sparks for the evening lecture": it
    // moves too. Its tier 1 and tier 2 set-ups (the discharge tube supply, the sphere generator) do not.
    expect(answer.lethal.applications).toEqual([["Long sparks for the electrostatics lecture", 3, 2]]);
    expect([...answer.lethal.permits].sort()).toEqual([
      ["Jar bank for the spring lecture series", 3, 2],
      ["Long sparks for the evening lecture", 3, 2],
    ]);

    // Previewing adopted nothing.
    expect(answer.rulesVersionAfter).toBe("benchclear-default-2");
  });
});
