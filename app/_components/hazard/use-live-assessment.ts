"use client";

import { useMemo } from "react";
import { setupFromText, type PathIssue } from "@/lib/apparatus/setup-text";
import { assessSetup, type Assessment, type SetupInput, type TierRules } from "@/lib/hazard";
import { setupTextSchema, type SetupText } from "@/lib/apparatus/schemas";

export type LiveAssessment = {
  setup: SetupInput | null;
  assessment: Assessment | null;
  /** Fields still to complete or correct (also when figures are shown without an incomplete gap). */
  issues: PathIssue[];
  /** Indices of spark gaps left out of the figures because their fields are not complete yet. */
  omittedGaps: number[];
  /** True while the engine is still being loaded (the application form loads it when first needed). */
  pending?: boolean;
};

/**
 * The engine's answer for a set-up as typed, recomputed on every change in the browser with the
 * same code and the same rules the server uses (the rules in force are passed down from the page).
 */
export function useLiveAssessment(text: unknown, rules: TierRules): LiveAssessment {
  const key = JSON.stringify(text ?? null);
  return useMemo(() => liveAssessmentOfJson(key, rules), [key, rules]);
}

/** The same, for the set-up text as JSON (what the hooks memoise on). */
export function liveAssessmentOfJson(json: string, rules: TierRules): LiveAssessment {
  const parsed = setupTextSchema.safeParse(JSON.parse(json) ?? {});
  if (!parsed.success)
    return {
      setup: null,
      assessment: null,
      issues: [{ path: [], message: "The set-up cannot be read." }],
      omittedGaps: [],
    };
  return liveAssessment(parsed.data, rules);
}

export function liveAssessment(text: SetupText, rules: TierRules): LiveAssessment {
  const { setup, issues } = setupFromText(text);
  if (setup) return { setup, assessment: assessSetup(setup, rules), issues: [], omittedGaps: [] };
  // A spark gap being filled in does not blank the figures: they are shown without it. A gap only
  // ever holds a voltage down, so leaving it out overstates the hazard, never understates it.
  const incomplete = [...new Set(issues.filter((i) => i.path[0] === "gaps").map((i) => Number(i.path[1])))];
  if (incomplete.length > 0 && issues.every((i) => i.path[0] === "gaps")) {
    const rest = setupFromText({ ...text, gaps: text.gaps.filter((_, index) => !incomplete.includes(index)) });
    if (rest.setup) {
      return { setup: rest.setup, assessment: assessSetup(rest.setup, rules), issues, omittedGaps: incomplete };
    }
  }
  return { setup: null, assessment: null, issues, omittedGaps: [] };
}
