import Link from "next/link";
import { Card } from "@/app/_components/card";
import type { CurrentUser } from "@/lib/auth/guards";
import { institutionToday } from "@/lib/permits/queries";
import { permitTrainingLapses } from "@/lib/training/queries";

/**
 * The dashboard's list (issue 17): active permits of the viewer's scope whose named operator's
 * training lapses before the permit's last day. Nothing when none.
 */
export async function TrainingLapsesSection({ user }: { user: CurrentUser }) {
  const rows = await permitTrainingLapses(user, await institutionToday(), { limit: 20 });
  if (rows.length === 0) return null;
  return (
    <Card
      title="Operator training lapses under active permits"
      description="A named operator's required course lapses before the permit's last day."
      flush
    >
      <ul className="divide-y divide-stone-100" data-testid="training-lapses">
        {rows.map((r) => (
          <li key={`${r.permitId}-${r.operator}-${r.course}`} className="flex flex-col gap-0.5 px-4 py-3 text-sm">
            <Link href={`/permits/${r.permitId}`} className="figure font-medium text-ink-800 underline">
              {r.number}
            </Link>
            <span className="text-stone-800">
              {r.operator}: {r.course} {r.lapsesOn ? `lapses on ${r.lapsesOn}` : "not recorded"}
              <span className="text-stone-600"> · permit valid to {r.validTo}</span>
            </span>
          </li>
        ))}
      </ul>
    </Card>
  );
}
