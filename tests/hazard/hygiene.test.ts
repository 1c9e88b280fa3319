import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

// The engine must run unchanged in the browser and on the server, and its text follows the house
// rules: no unfinished-work markers, nothing borrowed by name from people or recorded material.

const root = path.resolve(import.meta.dirname, "../..");
const engineDir = path.join(root, "lib/hazard");
const engineFiles = readdirSync(engineDir)
  .filter((name) => name.endsWith(".ts"))
  .map((name) => path.join(engineDir, name));
const ownFiles = [
  ...engineFiles,
  path.join(root, "lib/apparatus/setup-schema.ts"),
  ...readdirSync(import.meta.dirname)
    .filter((name) => name.endsWith(".ts") && name !== path.basename(import.meta.filename))
    .map((name) => path.join(import.meta.dirname, name)),
];

describe("lib/hazard stays portable", () => {
  it.each(engineFiles.map((file) => [path.basename(file), file]))("%s imports only sibling modules", (_name, file) => {
    const source = readFileSync(file, "utf8");
    const imports = [...source.matchAll(/from\s+"([^"]+)"/g)].map((match) => match[1]);
    for (const specifier of imports) expect(specifier).toMatch(/^\.\//);
    expect(source).not.toMatch(/\b(process|require|window|document|Date\.now|Math\.random)\b/);
  });
});

describe("wording", () => {
  // Assembled from pieces so this file does not match its own patterns.
  const markers = new RegExp(
    ["TO" + "DO", "FIX" + "ME", "X" + "XX", "st" + "ub"].map((w) => `\\b${w}\\b`).join("|"),
    "i",
  );
  const borrowed = new RegExp(
    ["kel" + "vin", "lo" + "rd", "lec" + "ture", "re" + "cording", "ta" + "lk"].join("|"),
    "i",
  );

  it.each(ownFiles.map((file) => [path.relative(root, file), file]))(
    "%s has no markers or borrowed names",
    (_name, file) => {
      const source = readFileSync(file, "utf8");
      expect(source).not.toMatch(markers);
      expect(source).not.toMatch(borrowed);
    },
  );
});
