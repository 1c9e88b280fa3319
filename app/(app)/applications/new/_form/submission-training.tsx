"use client";

import { describeGap, STATUS_LABELS, type TrainingStatus } from "@/lib/training/status";

// Each named operator's training beside their name on the form's last step (issue 17), as the
// server checked it (GET /api/applications/[id]/training: the tier's required courses, current
// through the permit's proposed last day — the same check the final approval runs). Only words here:
// the check itself stays on the server.

export type SubmissionTraining = {
  tier: number | null;
  throughDay: string | null;
  operators: {
    operator: string;
    userId: string | null;
    courses: { courseTypeId: string; course: string; status: TrainingStatus; lapsesOn: string | null }[];
  }[];
};

export function SubmissionTrainingList({ check }: { check: SubmissionTraining }) {
  const required = check.operators[0]?.courses.length ?? 0;
  if (check.operators.length === 0 || required === 0) {
    return <span className="text-stone-700">No course is required at this tier.</span>;
  }
  const gaps = check.operators.some((o) => o.courses.some((c) => c.status !== "current"));
  return (
    <div className="flex flex-col gap-2" data-testid="submission-training">
      <ul className="flex flex-col gap-2">
        {check.operators.map((o, i) => (
          <li key={`${o.userId ?? o.operator}-${i}`}>
            <span className="font-medium">{o.operator || "Unnamed operator"}</span>
            {!o.userId && <span className="text-stone-600"> (no Benchclear account: no record)</span>}
            <ul className="mt-0.5 flex flex-col">
              {o.courses.map((c) => {
                const ok = c.status === "current";
                return (
                  <li key={c.courseTypeId} className={ok ? "text-stone-700" : "text-red-800"}>
                    <span aria-hidden="true">{ok ? "✓ " : "✗ "}</span>
                    {ok ? `${c.course}: current, lapses on ${c.lapsesOn}` : describeGap(c)}
                    <span className="sr-only"> ({STATUS_LABELS[c.status]})</span>
                  </li>
                );
              })}
            </ul>
          </li>
        ))}
      </ul>
      <p className="text-xs text-stone-600">
        Courses this tier requires, current through {check.throughDay} (the permit&apos;s proposed last day).
        {gaps &&
          " You can submit; the final approval waits until the training is recorded or the approver records an exception with a reason."}
      </p>
    </div>
  );
}
