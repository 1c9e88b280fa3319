// The pre-use checklist of one permit, built from what the permit requires: the controls its
// application confirmed for the tier (lib/hazard requiredControls, frozen in the revision) and the
// conditions printed on the permit. Each control becomes a question that can be answered at the bench
// with the set-up in front of you; each condition is asked as written. Pure and browser-safe: the
// phone page shows it, the server rebuilds it to check that every item was answered.
// The wording of each question is Benchclear's own (common practice), not a quotation of a standard.

export type ChecklistItem = { id: string; text: string; group: "general" | "control" | "condition" };

/** What the checklist is built from: a revision's `controls.required` and the permit's conditions. */
export type ChecklistSource = {
  tier: number;
  controls: readonly { code: string; text: string }[];
  conditions: readonly string[];
  /** The limited approach distance in metres, when the tables give one (printed in the question). */
  limitedApproach_m?: number | null;
};

// Controls that are met before the day (a sign-off, a warning given when the audience was invited)
// are still asked: a check is the moment to notice that one was missed.
const QUESTIONS: Record<string, string> = {
  "warning-sign": "Warning sign posted at the bench",
  "grounding-hook": "Grounding (shorting) hook present and within reach",
  "hook-inspected": "Grounding hook inspected: lead, clamp and insulation intact",
  "discharge-after-use": "Everyone operating knows to discharge and short every capacitor after use",
  "audience-distance": "Audience outside the limited approach distance",
  "implant-warning": "People with implanted medical devices warned",
  bleeder: "Bleeder or automatic shorting tested today",
  "insulated-barrier": "Insulated barrier in place",
  "named-operator": "The operator named on the permit is here and runs the set-up",
  "second-person": "Second trained person present",
  "barrier-at-limited-approach": "Barrier in place at the limited approach distance",
  "written-discharge-procedure": "Written discharge procedure posted at the bench",
  lockout: "Supply key switch or lockout in place and working",
  "interlock-or-remote": "Enclosure interlock tested, or firing is remote",
  "eye-hearing-protection": "Eye and hearing protection at hand for everyone inside the barrier",
  "officer-pre-use-check": "A safety officer has looked over the set-up before use",
};

const DISTANCE_CODES = new Set(["audience-distance", "barrier-at-limited-approach"]);

function metres(value: number): string {
  return `${Number(value.toPrecision(3))} m`;
}

/** The checklist of a permit, in a fixed order: the set-up itself, the tier's controls, the conditions. */
export function buildChecklist(source: ChecklistSource): ChecklistItem[] {
  const items: ChecklistItem[] = [
    { id: "general:setup", text: "The set-up at the bench is the one on the permit", group: "general" },
  ];
  const seen = new Set<string>();
  for (const control of source.controls) {
    if (!control.code || seen.has(control.code)) continue;
    seen.add(control.code);
    let text = QUESTIONS[control.code] ?? control.text.replace(/\.$/, "");
    if (DISTANCE_CODES.has(control.code) && source.limitedApproach_m) {
      text += ` (${metres(source.limitedApproach_m)})`;
    }
    items.push({ id: `control:${control.code}`, text, group: "control" });
  }
  source.conditions.forEach((condition, index) => {
    const text = condition.trim();
    if (text) items.push({ id: `condition:${index + 1}`, text, group: "condition" });
  });
  return items;
}
