"use client";

import { useMemo } from "react";
import { setupFromText, type PathIssue } from "@/lib/apparatus/setup-text";
import { assessSetup, type Assessment, type SetupInput, type TierRules } from "@/lib/hazard";
import { setupTextSchema, type SetupText } from "@/lib/validation/apparatus";

export type LiveAssessment = { setup: SetupInput | null; assessment: Assessment | null; issues: PathIssue[] };

/**
 * The engine's answer for a set-up as typed, recomputed on every change in the browser with the
 * same code and the same rules the server uses (the rules in force are passed down from the page).
 */
export function useLiveAssessment(text: unknown, rules: TierRules): LiveAssessment {
  const key = JSON.stringify(text ?? null);
  return useMemo(() => {
    const parsed = setupTextSchema.safeParse(JSON.parse(key) ?? {});
    if (!parsed.success)
      return { setup: null, assessment: null, issues: [{ path: [], message: "The set-up cannot be read." }] };
    return liveAssessment(parsed.data, rules);
  }, [key, rules]);
}

export function liveAssessment(text: SetupText, rules: TierRules): LiveAssessment {
  const { setup, issues } = setupFromText(text);
  if (!setup) return { setup: null, assessment: null, issues };
  return { setup, assessment: assessSetup(setup, rules), issues: [] };
}
