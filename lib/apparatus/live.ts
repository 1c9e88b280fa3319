// What the live panel says beside the figures: which field a problem is in (by the words on the form,
// not a path), and which spark gap holds the voltage down. Pure, so the registry form and the
// application form say the same, and tests can call it directly.

import { assessSetup, type Assessment, type SetupInput, type TierRules } from "@/lib/hazard";
import type { SetupText } from "@/lib/apparatus/schemas";
import { BODY_RESISTANCE_FIELD, GAP_FIELDS, SOURCE_FIELDS, type Path, type PathIssue } from "./setup-text";

/** "G1" for the first spark gap: gaps have no label of their own, so the form numbers them. */
export function gapLabel(index: number): string {
  return `G${index + 1}`;
}

const OTHER_LABELS: Record<string, string> = {
  label: "Label",
  kind: "Kind",
  count: "Number of units",
  arrangement: "Arrangement",
};

/** "Energy source 1 (C1): Charging voltage of the bank", "Spark gap 1: Gap spacing". */
export function fieldLabel(path: Path, text: Partial<SetupText> | undefined): string {
  const [group, index, field] = path;
  if (group === "sources" && typeof index === "number") {
    const source = text?.sources?.[index];
    const name = `Energy source ${index + 1}${source?.label ? ` (${source.label})` : ""}`;
    if (typeof field !== "string") return name;
    const spec = source ? SOURCE_FIELDS[source.kind]?.find((s) => s.name === field) : undefined;
    return `${name}: ${spec?.label ?? OTHER_LABELS[field] ?? field}`;
  }
  if (group === "gaps" && typeof index === "number") {
    const name = `Spark gap ${index + 1} (${gapLabel(index)})`;
    if (typeof field !== "string") return name;
    return `${name}: ${GAP_FIELDS.find((s) => s.name === field)?.label ?? field}`;
  }
  if (group === "bodyResistance_ohm") return BODY_RESISTANCE_FIELD.label;
  if (group === "sources") return "Energy sources";
  return "The set-up";
}

/** The form name of a set-up field ("apparatus.setup" + ["sources", 0, "voltage_V"]). */
export function formFieldName(prefix: string, path: Path): string {
  return [prefix, ...path].join(".");
}

/** Issues with a field to go to first, each named once. */
export function namedIssues(issues: readonly PathIssue[], text: Partial<SetupText> | undefined) {
  const seen = new Set<string>();
  const out: { path: Path; label: string; message: string }[] = [];
  for (const issue of issues) {
    const key = issue.path.join(".");
    if (seen.has(key)) continue;
    seen.add(key);
    out.push({ path: issue.path, label: fieldLabel(issue.path, text), message: issue.message });
  }
  return out;
}

export type GapLimit = {
  /** Index of the gap that breaks down lowest (in the set-up as typed). */
  gapIndex: number;
  /** Its breakdown voltage (peak), the ceiling. */
  ceiling_V: number;
  /** The highest voltage a source is set to, before the gap. */
  requested_V: number;
};

/**
 * The gap that holds the highest voltage below what a source is set to, or null when no gap does.
 * Each gap is assessed alone with the same sources, so the one whose ceiling is the set-up's ceiling
 * is the one named; the figures themselves are the engine's.
 */
export function gapLimit(setup: SetupInput | null, assessment: Assessment | null, rules: TierRules): GapLimit | null {
  if (!setup?.gaps?.length || !assessment || assessment.gapCeiling_V === null) return null;
  const reason = assessment.reasons.find((r) => r.criterion === "gap-ceiling");
  if (!reason || !(reason.value > reason.threshold)) return null;
  const ceiling = assessment.gapCeiling_V;
  let gapIndex = 0;
  if (setup.gaps.length > 1) {
    let best = Infinity;
    setup.gaps.forEach((gap, index) => {
      try {
        const alone = assessSetup({ ...setup, gaps: [gap] }, rules).gapCeiling_V ?? Infinity;
        const distance = Math.abs(alone - ceiling);
        if (distance < best) {
          best = distance;
          gapIndex = index;
        }
      } catch {
        // A gap the engine refuses alone cannot be the one that limits the whole set-up.
      }
    });
  }
  return { gapIndex, ceiling_V: ceiling, requested_V: reason.value };
}
