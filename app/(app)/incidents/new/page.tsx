import type { Metadata } from "next";
import Link from "next/link";
import { Card } from "@/app/_components/card";
import { PageHeader } from "@/app/_components/page-header";
import { requirePageUser } from "@/lib/auth/guards";
import { reportLinkChoices } from "@/lib/incidents/queries";
import { instantToWallTime } from "@/lib/incidents/time";
import { institutionTimeZone } from "@/lib/settings/queries";
import { ReportForm } from "../_components/report-form";

export const metadata: Metadata = { title: "Report an incident or near miss" };

type PageProps = { searchParams: Promise<Record<string, string | string[] | undefined>> };

const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v) ?? "";

export default async function NewIncidentPage({ searchParams }: PageProps) {
  const user = await requirePageUser("incident.report", "/incidents/new");
  const raw = await searchParams;
  const [choices, timeZone] = await Promise.all([reportLinkChoices(user), institutionTimeZone()]);
  // A link from a permit or apparatus page preselects it, when it is one of the choices.
  const permitId = choices.permits.some((p) => p.id === one(raw.permit)) ? one(raw.permit) : "";
  const apparatusId = choices.apparatus.some((a) => a.id === one(raw.apparatus)) ? one(raw.apparatus) : "";
  return (
    <>
      <PageHeader
        eyebrow={<Link href="/incidents">Incidents</Link>}
        title="Report an incident or near miss"
        description="Anything that hurt someone or could have: a shock, a burn, an unexpected discharge, a missing barrier, a set-up left charged. The safety officers read every report."
      />
      <Card>
        <ReportForm
          permits={choices.permits}
          apparatus={choices.apparatus}
          defaults={{ permitId, apparatusId, occurredAt: instantToWallTime(new Date(), timeZone) }}
          timeZone={timeZone}
        />
      </Card>
    </>
  );
}
