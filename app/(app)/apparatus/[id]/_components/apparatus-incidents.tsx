import Link from "next/link";
import { Card } from "@/app/_components/card";
import { IncidentLinks } from "@/app/_components/incident-list";
import type { CurrentUser } from "@/lib/auth/guards";
import { listIncidents } from "@/lib/incidents/queries";
import { institutionTimeZone } from "@/lib/settings/queries";

/** The apparatus page's panel of incident and near-miss reports that name it (those this user may read). */
export async function ApparatusIncidents({ user, apparatusId }: { user: CurrentUser; apparatusId: string }) {
  const [{ rows, total }, timeZone] = await Promise.all([listIncidents(user, { apparatusId }), institutionTimeZone()]);
  return (
    <Card title="Incidents and near misses">
      <IncidentLinks
        rows={rows}
        timeZone={timeZone}
        empty="No reports you can see name this apparatus."
        footer={
          <p className="flex flex-wrap gap-x-3">
            {total > rows.length && (
              <Link
                href={`/incidents?apparatusId=${apparatusId}`}
                className="text-ink-800 underline decoration-ink-300"
              >
                All {total} reports
              </Link>
            )}
            <Link
              href={`/incidents/new?apparatus=${apparatusId}`}
              className="text-ink-800 underline decoration-ink-300"
            >
              Report an incident or near miss
            </Link>
          </p>
        }
      />
    </Card>
  );
}
