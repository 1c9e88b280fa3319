// What changed in an apparatus since a permit approved it: the permit's frozen set-up (its
// revision's content) against a newer registry revision, field by field with units, and the figures
// the engine gives each. Pure; the same rows as the reviewers' revision diff (lib/review/diff.ts),
// kept to the parts an apparatus revision can change.

import { normalizeSetup } from "@/lib/apparatus/setup-text";
import type { Assessment, SetupInput } from "@/lib/hazard";
import { revisionDiff, type DiffEntry } from "@/lib/review/diff";

export type ApparatusRevisionView = { name: string; room: string; notes: string; setup: SetupInput };

const APPARATUS_SECTIONS = new Set<DiffEntry["section"]>([
  "Apparatus",
  "Energy sources",
  "Spark gaps",
  "Bleeders",
  "Figures",
]);

/**
 * Every apparatus field and figure whose shown value differs between the permit's revision and the
 * new apparatus revision. The new set-up is normalised as a submission would store it, so a value
 * spelt differently ("4.7 nF" and "4700 pF") is not a change.
 */
export function apparatusChangeDiff(
  permit: { content: Record<string, unknown>; assessment: Assessment },
  revision: ApparatusRevisionView,
  assessment: Assessment,
): DiffEntry[] {
  const approved = (permit.content.apparatus ?? {}) as Record<string, unknown>;
  const after = {
    ...permit.content,
    apparatus: {
      ...approved,
      name: revision.name,
      room: revision.room,
      notes: revision.notes,
      setup: normalizeSetup(revision.setup) ?? revision.setup,
    },
  };
  return revisionDiff(permit, { content: after, assessment }).filter((e) => APPARATUS_SECTIONS.has(e.section));
}
