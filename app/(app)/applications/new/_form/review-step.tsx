"use client";

import { useMemo } from "react";
import { useFormContext, useFormState, useWatch } from "react-hook-form";
import { AboutFigures } from "@/app/_components/about-figures";
import { headlineFigures } from "@/app/_components/hazard/figures";
import type { LiveAssessment } from "@/app/_components/hazard/use-live-assessment";
import { TierBadge } from "@/app/_components/tier-badge";
import { ATTESTATION_TEXT, draftToContent } from "@/lib/applications/draft";
import { formatBytes } from "@/lib/applications/limits";
import type { ControlRule, Tier, TierRules } from "@/lib/hazard";
import {
  AUDIENCE_LABELS,
  EVENT_KIND_LABELS,
  STEP_TITLES,
  type ApplicationDraft,
  type AttachmentRef,
  type FormStep,
} from "@/lib/applications/schemas";
import { controlText } from "./control-text";
import { messageAt } from "./errors";
import { SubmissionTrainingList, type SubmissionTraining } from "./submission-training";

type ReviewStepProps = {
  live: LiveAssessment;
  required: readonly ControlRule[];
  attachments: readonly AttachmentRef[];
  /** The tier rules in force: what still stands between the draft and a submission is checked here
   * with the same code the server runs on submission. */
  rules: TierRules;
  /** Each named operator's training as the server checked it (undefined until it answers). */
  training?: SubmissionTraining;
  onGoTo: (step: FormStep) => void;
};

const STEP_OF: Record<string, FormStep> = { event: 1, apparatus: 2, controls: 4, attachments: 5, attestation: 6 };

function stepOfPath(path: string): FormStep {
  return STEP_OF[path.split(/[.[]/)[0]] ?? 6;
}

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="grid gap-1 py-1.5 sm:grid-cols-[12rem_1fr]">
      <dt className="text-sm text-stone-600">{label}</dt>
      <dd className="text-sm text-stone-900">{children || <span className="text-stone-500">—</span>}</dd>
    </div>
  );
}

export function ReviewStep({ live, required, attachments, rules, training, onGoTo }: ReviewStepProps) {
  const { control, register } = useFormContext<ApplicationDraft>();
  const { errors } = useFormState({ control });
  const draft = useWatch({ control }) as ApplicationDraft;
  const issues = useMemo(() => draftToContent(draft, { rules, attachments }).issues, [draft, rules, attachments]);
  const event = draft.event;
  const apparatus = draft.apparatus;
  const outstanding = issues.filter((i) => !i.path.startsWith("attestation"));
  const attestationError = messageAt(errors, "attestation.accepted");

  return (
    <div className="flex flex-col gap-6">
      {outstanding.length > 0 && (
        <section aria-labelledby="outstanding-heading" className="rounded-lg border border-red-300 bg-red-50 px-4 py-3">
          <h3 id="outstanding-heading" className="text-sm font-semibold text-red-950">
            Still to do before submitting
          </h3>
          <ul className="mt-1 flex flex-col gap-1 text-sm text-red-950">
            {outstanding.map((issue) => (
              <li key={`${issue.path}-${issue.message}`}>
                {issue.message}{" "}
                <button type="button" className="underline" onClick={() => onGoTo(stepOfPath(issue.path))}>
                  Go to step {stepOfPath(issue.path)} ({STEP_TITLES[stepOfPath(issue.path)]})
                </button>
              </li>
            ))}
          </ul>
        </section>
      )}

      <section aria-labelledby="summary-event">
        <h3 id="summary-event" className="text-base font-semibold text-stone-900">
          Event
        </h3>
        <dl className="mt-1 divide-y divide-stone-100">
          <Row label="Title">{event.title}</Row>
          <Row label="Kind">{event.kind ? EVENT_KIND_LABELS[event.kind] : ""}</Row>
          <Row label="Room">{event.room}</Row>
          <Row label="Audience">
            {event.audience
              ? `${AUDIENCE_LABELS[event.audience]}${event.audienceSize ? `, ${event.audienceSize}` : ""}`
              : ""}
          </Row>
          <Row label="Days">{event.firstDay && event.lastDay ? `${event.firstDay} to ${event.lastDay}` : ""}</Row>
          <Row label="Responsible">{event.responsible.name}</Row>
          <Row label="Operators">
            {event.operators
              .map((o) => `${o.name}${o.trained ? " (trained)" : ""}`)
              .filter(Boolean)
              .join(", ")}
          </Row>
          {training !== undefined && (
            <Row label="Operators' training">
              <SubmissionTrainingList check={training} />
            </Row>
          )}
        </dl>
      </section>

      <section aria-labelledby="summary-apparatus">
        <h3 id="summary-apparatus" className="text-base font-semibold text-stone-900">
          Apparatus and hazard
        </h3>
        <dl className="mt-1 divide-y divide-stone-100">
          <Row label="Apparatus">{apparatus.name}</Row>
          <Row label="Energy sources">
            {apparatus.setup.sources.map((s, i) => s.label || `Source ${i + 1}`).join(", ")}
          </Row>
          <Row label="Spark gaps">{apparatus.setup.gaps.length || ""}</Row>
          <Row label="Tier">{live.assessment ? <TierBadge tier={live.assessment.tier as Tier} /> : ""}</Row>
          {live.assessment &&
            headlineFigures(live.assessment).map((f) => (
              <Row key={f.label} label={f.label}>
                <span className="figure">{f.value}</span>
              </Row>
            ))}
        </dl>
      </section>

      <section aria-labelledby="summary-controls">
        <h3 id="summary-controls" className="text-base font-semibold text-stone-900">
          Controls
        </h3>
        {required.length === 0 ? (
          <p className="mt-1 text-sm text-stone-700">None required at this tier.</p>
        ) : (
          <ul className="mt-1 flex flex-col gap-1 text-sm">
            {required.map((rule) => {
              const entry = draft.controls.required.find((e) => e.code === rule.id);
              return (
                <li key={rule.id}>
                  <span className="font-medium">{entry?.confirmed ? "Confirmed: " : "Not confirmed: "}</span>
                  {controlText(rule, live.assessment)}
                  {entry?.note ? <span className="text-stone-600"> — {entry.note}</span> : null}
                </li>
              );
            })}
          </ul>
        )}
        {draft.controls.additional && (
          <p className="mt-2 text-sm whitespace-pre-line text-stone-800">
            <span className="font-medium">Additional: </span>
            {draft.controls.additional}
          </p>
        )}
      </section>

      <section aria-labelledby="summary-files">
        <h3 id="summary-files" className="text-base font-semibold text-stone-900">
          Attachments
        </h3>
        {attachments.length === 0 ? (
          <p className="mt-1 text-sm text-stone-700">None.</p>
        ) : (
          <ul className="mt-1 text-sm">
            {attachments.map((a) => (
              <li key={a.id}>
                {a.filename} <span className="figure text-stone-600">({formatBytes(a.size_B)})</span>
              </li>
            ))}
          </ul>
        )}
      </section>

      <AboutFigures />

      <section aria-labelledby="attest-heading" className="rounded-lg border border-stone-300 bg-white px-4 py-3">
        <h3 id="attest-heading" className="text-base font-semibold text-stone-900">
          Attestation
        </h3>
        <label className="mt-2 flex items-start gap-2 text-sm text-stone-900">
          <input
            type="checkbox"
            className="mt-0.5 size-4"
            aria-invalid={attestationError ? true : undefined}
            aria-describedby={attestationError ? "attestation-error" : undefined}
            {...register("attestation.accepted")}
          />
          <span>{ATTESTATION_TEXT}</span>
        </label>
        <p id="attestation-error" aria-live="polite" className="text-sm text-red-800">
          {attestationError}
        </p>
      </section>
    </div>
  );
}
