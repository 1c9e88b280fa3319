// The application form's plain words: its steps and the choices of step 1. No zod here: the form's
// first step imports this module, and the schemas (lib/applications/schemas.ts, which re-exports
// these) are loaded by the browser only when a step is first checked.

export const EVENT_KINDS = ["lecture_demonstration", "outreach_event", "teaching_lab", "research_bench"] as const;
export const EVENT_KIND_LABELS: Record<(typeof EVENT_KINDS)[number], string> = {
  lecture_demonstration: "Lecture demonstration",
  outreach_event: "Outreach event",
  teaching_lab: "Teaching lab",
  research_bench: "Research bench",
};
export const AUDIENCES = ["none", "students", "public"] as const;
export const AUDIENCE_LABELS: Record<(typeof AUDIENCES)[number], string> = {
  none: "No audience",
  students: "Students",
  public: "Members of the public",
};

export const FORM_STEPS = [1, 2, 3, 4, 5, 6] as const;
export type FormStep = (typeof FORM_STEPS)[number];
export const STEP_TITLES: Record<FormStep, string> = {
  1: "Event",
  2: "Apparatus",
  3: "Hazard result",
  4: "Controls",
  5: "Attachments",
  6: "Review and attest",
};
