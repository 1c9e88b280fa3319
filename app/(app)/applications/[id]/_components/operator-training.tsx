import { Card } from "@/app/_components/card";
import { formatSignedAt } from "@/app/_components/format";
import type { TrainingCheck } from "@/lib/review/training";
import { describeGap, gapKey, STATUS_LABELS } from "@/lib/training/status";
import { TrainingExceptionForm } from "./training-exception-form";

// Each named operator's training against the courses the tier requires, through the permit's last
// day (issue 17): shown to the applicant after submission and to every reviewer. A lapsed or missing
// course holds the final approval until it is recorded or the final approver records a signed
// exception; the form for that is here, for that approver only.

export function OperatorTraining({
  check,
  timeZone,
  exception,
}: {
  check: TrainingCheck;
  timeZone: string;
  /** Set when the viewer gives the final approval now. */
  exception: { applicationId: string; version: number } | null;
}) {
  const courses = check.operators[0]?.courses.length ?? 0;
  if (check.operators.length === 0 || courses === 0) return null;
  const covered = new Set(check.exceptions.flatMap((e) => e.gaps).map(gapKey));
  return (
    <Card
      title="Named operators' training"
      description={`The courses this tier requires, current through ${check.throughDay} (the permit's proposed last day).`}
    >
      <ul className="flex flex-col gap-3 text-sm" data-testid="operator-training">
        {check.operators.map((o, i) => (
          <li key={`${o.userId ?? o.operator}-${i}`}>
            <p className="font-medium text-stone-900">
              {o.operator || "Unnamed operator"}
              {!o.userId && <span className="font-normal text-stone-600"> (no Benchclear account: no record)</span>}
            </p>
            <ul className="mt-1 flex flex-col gap-0.5">
              {o.courses.map((c) => {
                const key = gapKey({ operator: o.operator, userId: o.userId, courseTypeId: c.courseTypeId });
                const ok = c.status === "current";
                return (
                  <li key={c.courseTypeId} className={ok ? "text-stone-700" : "text-red-800"}>
                    <span aria-hidden="true">{ok ? "✓ " : "✗ "}</span>
                    {ok ? `${c.course}: current, lapses on ${c.lapsesOn}` : describeGap(c)}
                    <span className="sr-only"> ({STATUS_LABELS[c.status]})</span>
                    {!ok && covered.has(key) && <span className="text-stone-700"> — exception recorded</span>}
                  </li>
                );
              })}
            </ul>
          </li>
        ))}
      </ul>
      {check.exceptions.length > 0 && (
        <div className="mt-4 border-t border-stone-200 pt-3">
          <h3 className="text-sm font-medium text-stone-800">Training exceptions</h3>
          <ul className="mt-1 flex flex-col gap-2 text-sm">
            {check.exceptions.map((e) => (
              <li key={e.id}>
                <p className="whitespace-pre-line text-stone-900">{e.reason}</p>
                <p className="text-xs text-stone-600">
                  Signed by {e.signerName} ({e.signerRole}), {formatSignedAt(e.signedAt, timeZone)}; covers{" "}
                  {e.gaps.map((g) => `${g.operator}: ${g.course}`).join(", ")}
                </p>
              </li>
            ))}
          </ul>
        </div>
      )}
      {check.open.length > 0 && (
        <p className="mt-3 text-sm font-medium text-red-800">
          The final approval waits until this training is recorded, or the approver records an exception.
        </p>
      )}
      {exception && check.open.length > 0 && (
        <TrainingExceptionForm
          applicationId={exception.applicationId}
          version={exception.version}
          throughDay={check.throughDay}
          gaps={check.open.map((g) => `${g.operator}: ${describeGap(g)}`)}
        />
      )}
    </Card>
  );
}
