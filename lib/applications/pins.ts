// Where a reviewer's return comment points: a form step ("step:2") or a field of the application
// ("event.firstDay", "apparatus.setup.sources[0]", "apparatus.setup.gaps[1]"). One list of what can be
// pinned, built from the form's one list of step titles, so the reviewer's choices, the applicant's
// link to the step and the labels on every page agree. Pure: used by server pages and the form.

import { FORM_STEPS, STEP_TITLES, type FormStep } from "@/lib/applications/form-steps";

export type PinOption = { value: string; label: string };

const FIELD_PINS: readonly (PinOption & { step: FormStep })[] = [
  { value: "event.title", label: "Event title", step: 1 },
  { value: "event.room", label: "Room or place", step: 1 },
  { value: "event.firstDay", label: "First day", step: 1 },
  { value: "event.lastDay", label: "Last day", step: 1 },
  { value: "event.operators", label: "Operators", step: 1 },
  { value: "controls.additional", label: "Additional controls", step: 4 },
];

/** The first part of a field path decides its step. */
const STEP_OF_GROUP: Record<string, FormStep> = { event: 1, apparatus: 2, controls: 4, attachments: 5, attestation: 6 };

type PinnableContent = {
  apparatus?: { setup?: { sources?: readonly { id?: string; label?: string }[]; gaps?: readonly unknown[] } };
};

/** The step a pin belongs to, or null for a pin that names none. */
export function pinStep(pin: string | null | undefined): FormStep | null {
  if (!pin) return null;
  const step = /^step:([1-6])$/.exec(pin);
  if (step) return Number(step[1]) as FormStep;
  return STEP_OF_GROUP[pin.split(/[.[]/)[0]] ?? null;
}

/** "step 2 (Apparatus)", "Energy source 1 (C1)", "Spark gap 1 (G1)", "First day". */
export function pinLabel(pin: string, content?: PinnableContent | null): string {
  const step = /^step:([1-6])$/.exec(pin);
  if (step) return `step ${step[1]} (${STEP_TITLES[Number(step[1]) as FormStep]})`;
  const field = FIELD_PINS.find((p) => p.value === pin);
  if (field) return field.label;
  const source = /^apparatus\.setup\.sources\[(\d+)\]/.exec(pin);
  if (source) {
    const i = Number(source[1]);
    const s = content?.apparatus?.setup?.sources?.[i];
    const name = s?.id || s?.label;
    return `Energy source ${i + 1}${name ? ` (${name})` : ""}`;
  }
  const gap = /^apparatus\.setup\.gaps\[(\d+)\]/.exec(pin);
  if (gap) return `Spark gap ${Number(gap[1]) + 1} (G${Number(gap[1]) + 1})`;
  return pin;
}

/** What a reviewer may pin a return comment to, for this application's content. */
export function pinOptions(content?: PinnableContent | null): PinOption[] {
  const setup = content?.apparatus?.setup;
  return [
    ...FORM_STEPS.map((s) => ({ value: `step:${s}`, label: `Step ${s} · ${STEP_TITLES[s]}` })),
    ...FIELD_PINS.map(({ value, label }) => ({ value, label })),
    ...(setup?.sources ?? []).map((_, i) => ({
      value: `apparatus.setup.sources[${i}]`,
      label: pinLabel(`apparatus.setup.sources[${i}]`, content),
    })),
    ...(setup?.gaps ?? []).map((_, i) => ({
      value: `apparatus.setup.gaps[${i}]`,
      label: pinLabel(`apparatus.setup.gaps[${i}]`, content),
    })),
  ];
}
