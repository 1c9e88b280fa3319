import { Card } from "@/app/_components/card";
import { formatDate } from "@/app/_components/format";
import type { CurrentUser } from "@/lib/auth/guards";
import { getUpkeep } from "@/lib/upkeep/queries";
import { INSPECTION_KIND_LABELS, INSPECTION_RESULT_LABELS } from "@/lib/upkeep/schemas";
import { InspectionForm, IntervalForm, RecordPhoto, RetireForm } from "./apparatus-upkeep-forms";

const RESULT_CLASSES = {
  pass: "text-emerald-800",
  repaired: "text-ink-800",
  fail: "font-semibold text-red-800",
} as const;

/** The apparatus page's upkeep panel: next inspection, records, and (for its keepers) the forms. */
export async function ApparatusUpkeep({ user, apparatusId }: { user: CurrentUser; apparatusId: string }) {
  const upkeep = await getUpkeep(user, apparatusId);
  const { status } = upkeep;
  return (
    <Card title="Inspections and maintenance">
      <div className="flex flex-col gap-4 text-sm">
        {upkeep.retired ? (
          <p className="text-stone-700">Retired: no more inspections are due.</p>
        ) : status ? (
          <p
            data-testid="inspection-status"
            className={
              status.state === "due"
                ? "font-semibold text-red-800"
                : status.state === "due_soon"
                  ? "text-orange-900"
                  : "text-stone-700"
            }
          >
            {status.state === "due"
              ? `Inspection due since ${formatDate(status.dueOn)}.`
              : `Next inspection due ${formatDate(status.dueOn)} (${status.daysLeft} days).`}{" "}
            <span className="font-normal text-stone-600">Every {upkeep.inspectionInterval_days} days.</span>
          </p>
        ) : (
          <p className="text-stone-600">No inspection interval set.</p>
        )}
        {upkeep.records.length === 0 ? (
          <p className="text-stone-600">No records yet.</p>
        ) : (
          <ul className="flex flex-col gap-3" aria-label="Inspection and maintenance records">
            {upkeep.records.map((r) => (
              <li key={r.id} className="border-b border-stone-100 pb-2 last:border-0">
                <span className="font-medium text-stone-900">{INSPECTION_KIND_LABELS[r.kind]}</span>{" "}
                <span className={RESULT_CLASSES[r.result]}>{INSPECTION_RESULT_LABELS[r.result]}</span>
                <span className="block text-xs text-stone-600">
                  <time dateTime={r.inspectedOn}>{formatDate(r.inspectedOn)}</time> · {r.inspectedBy}
                  {r.recordedByName !== r.inspectedBy ? ` (recorded by ${r.recordedByName})` : ""}
                </span>
                {r.note && <span className="block whitespace-pre-line text-stone-800">{r.note}</span>}
                {r.photo ? (
                  <a
                    href={`/api/apparatus/${apparatusId}/inspections/${r.id}/photo`}
                    className="text-xs text-ink-800 underline decoration-ink-300"
                  >
                    Photo: {r.photo}
                  </a>
                ) : (
                  upkeep.mayRecord && <RecordPhoto apparatusId={apparatusId} inspectionId={r.id} />
                )}
              </li>
            ))}
          </ul>
        )}
        {upkeep.mayRecord && <InspectionForm apparatusId={apparatusId} today={upkeep.today} defaultName={user.name} />}
        {upkeep.maySetInterval && <IntervalForm apparatusId={apparatusId} current={upkeep.inspectionInterval_days} />}
        {upkeep.mayRetire && <RetireForm apparatusId={apparatusId} />}
      </div>
    </Card>
  );
}
