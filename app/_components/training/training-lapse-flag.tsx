import { Alert } from "@/app/_components/alert";
import type { CurrentUser } from "@/lib/auth/guards";
import { institutionToday } from "@/lib/permits/queries";
import { permitTrainingLapses } from "@/lib/training/queries";

/**
 * The permit page's flag (issue 17): a named operator's required training lapses while the permit is
 * active (on or before its last day), or has no record. Nothing when all is current or the permit is
 * not active.
 */
export async function TrainingLapseFlag({ user, permitId }: { user: CurrentUser; permitId: string }) {
  const rows = await permitTrainingLapses(user, await institutionToday(), { permitId });
  if (rows.length === 0) return null;
  return (
    <Alert tone="warn" title="Operator training lapses while this permit is active" className="mb-6">
      <ul className="list-disc pl-5" data-testid="training-lapse-flag">
        {rows.map((r) => (
          <li key={`${r.operator}-${r.course}`}>
            {r.operator}: {r.course} {r.lapsesOn ? `lapses on ${r.lapsesOn}` : "is not recorded"}
          </li>
        ))}
      </ul>
      <span className="block">
        Only operators with current training may run the set-up after that day; a safety officer records the refresher
        on the Training page.
      </span>
    </Alert>
  );
}
