import type { Metadata } from "next";
import { isRecordId } from "@/lib/http/ids";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ButtonLink } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { DataTable } from "@/app/_components/data-table";
import { formatDateTime, isoDate } from "@/app/_components/format";
import { TierResult } from "@/app/_components/hazard/tier-result";
import { WayDownList } from "@/app/_components/hazard/way-down-list";
import { PageHeader } from "@/app/_components/page-header";
import type { Tier } from "@/app/_components/tier";
import { TierBadge } from "@/app/_components/tier-badge";
import { getApparatus } from "@/lib/apparatus/queries";
import { institutionTimeZone } from "@/lib/settings/queries";
import { GAP_FIELDS, SOURCE_FIELDS } from "@/lib/apparatus/setup-text";
import { can, requirePageUser } from "@/lib/auth/guards";
import { assessSetup, BASE_UNIT, formatQuantity, upgradeSetup, type EnergySource } from "@/lib/hazard";
import { currentTierRules } from "@/lib/hazard-rules";
import { AppError } from "@/lib/errors";
import { SOURCE_KIND_LABELS } from "@/lib/apparatus/schemas";
import { ApparatusIncidents } from "./_components/apparatus-incidents";
import { ApparatusUpkeep } from "./_components/apparatus-upkeep";
import { Alert } from "@/app/_components/alert";

export const metadata: Metadata = { title: "Apparatus" };

type PageProps = { params: Promise<{ id: string }> };

async function load(id: string) {
  const user = await requirePageUser("apparatus.read", `/apparatus/${id}`);
  if (!isRecordId(id)) notFound();
  try {
    return { user, apparatus: await getApparatus(user, id) };
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}

function sourceValues(source: EnergySource): string {
  const record = source as unknown as Record<string, number | undefined>;
  const parts = SOURCE_FIELDS[source.kind]
    .filter((spec) => record[spec.name] !== undefined)
    .map((spec) => `${spec.label}: ${formatQuantity(record[spec.name] as number, BASE_UNIT[spec.dimension])}`);
  if (source.kind === "capacitor" && source.count !== undefined) {
    parts.push(`${source.count} units, ${source.arrangement ?? "parallel"}`);
  }
  return parts.join(" · ");
}

export default async function ApparatusPage({ params }: PageProps) {
  const { id } = await params;
  const { user, apparatus } = await load(id);
  const current = apparatus.current;
  const [rules, timeZone] = await Promise.all([currentTierRules(), institutionTimeZone()]);
  // The figures under the rules and engine in force now; the stored revision keeps the ones it was
  // saved with. A revision saved before gaps were wired has its gaps set across its voltage-less
  // sphere terminals only, and the page asks for the wiring to be confirmed by editing.
  const { setup, rewired } = upgradeSetup(current.setup);
  const live = assessSetup(setup, rules);
  const changedSinceSaved = live.tier !== current.tier;

  return (
    <>
      <PageHeader
        eyebrow={<Link href="/apparatus">Apparatus</Link>}
        title={apparatus.name}
        description={
          <>
            {apparatus.room} · {apparatus.departmentName} · registered by {apparatus.ownerName} · revision{" "}
            {apparatus.currentRevision}
          </>
        }
        actions={
          <>
            {apparatus.canEdit && !apparatus.retiredAt && (
              <ButtonLink href={`/apparatus/${apparatus.id}/edit`} variant="secondary">
                Edit
              </ButtonLink>
            )}
            {can(user, "application.create") && !apparatus.retiredAt && (
              <ButtonLink href={`/applications/new?apparatus=${apparatus.id}`}>Use in an application</ButtonLink>
            )}
          </>
        }
      />
      {apparatus.retiredAt && (
        <Alert tone="warn" title="Retired" className="mb-6">
          Kept for the record: no longer offered for new applications and no longer edited. Retired{" "}
          {formatDateTime(apparatus.retiredAt, timeZone)}
          {apparatus.retiredReason ? `: ${apparatus.retiredReason}` : "."}
        </Alert>
      )}
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="flex min-w-0 flex-col gap-6">
          <Card title="Hazard result" description="Computed by the engine from the current revision.">
            {changedSinceSaved && (
              <p className="mb-3 text-sm text-stone-700">
                Revision {current.revision} was saved at tier {current.tier}; under the tier rules in force now it is
                tier {live.tier}.
              </p>
            )}
            {rewired && (
              <p role="status" className="mb-3 rounded border border-amber-300 bg-amber-50 p-2 text-sm text-amber-950">
                This revision was saved before each spark gap said which sources it is connected across. Its gaps are
                now taken as connected across the sphere terminals that have no voltage of their own, and across nothing
                else.{" "}
                {apparatus.canEdit
                  ? "Edit the apparatus to confirm the wiring."
                  : "Ask its owner to confirm the wiring."}
              </p>
            )}
            <TierResult assessment={live} setup={setup} rules={rules} headingLevel={3} />
            <div className="mt-4">
              <WayDownList assessment={live} setup={setup} rules={rules} />
            </div>
          </Card>
        </div>
        <div className="flex min-w-0 flex-col gap-6">
          <Card title="Set-up">
            <h3 className="text-sm font-semibold text-stone-900">Energy sources</h3>
            <ul className="mt-1 flex flex-col gap-2 text-sm">
              {current.setup.sources.map((s, i) => (
                <li key={i}>
                  <span className="font-medium text-stone-900">{s.id ?? `Source ${i + 1}`}</span>{" "}
                  <span className="text-stone-600">({SOURCE_KIND_LABELS[s.kind]})</span>
                  <span className="figure block text-xs text-stone-700">{sourceValues(s)}</span>
                </li>
              ))}
            </ul>
            {(current.setup.gaps ?? []).length > 0 && (
              <>
                <h3 className="mt-3 text-sm font-semibold text-stone-900">Spark gaps</h3>
                <ul className="mt-1 flex flex-col gap-1 text-sm">
                  {(setup.gaps ?? []).map((g, i) => (
                    <li key={i} className="figure text-xs text-stone-700">
                      {GAP_FIELDS.filter((spec) => g[spec.name] !== undefined)
                        .map(
                          (spec) =>
                            `${spec.label}: ${formatQuantity(g[spec.name] as number, BASE_UNIT[spec.dimension])}`,
                        )
                        .join(" · ")}
                      {" · connected across: "}
                      {g.across && g.across.length > 0 ? g.across.join(", ") : "nothing"}
                    </li>
                  ))}
                </ul>
              </>
            )}
            {apparatus.notes && <p className="mt-3 text-sm whitespace-pre-line text-stone-700">{apparatus.notes}</p>}
          </Card>
          <ApparatusUpkeep user={user} apparatusId={apparatus.id} />
          <ApparatusIncidents user={user} apparatusId={apparatus.id} />
          <Card title="Revisions" flush>
            <DataTable
              caption="Revisions"
              rows={apparatus.revisions}
              rowKey={(r) => r.id}
              columns={[
                { key: "revision", header: "Rev.", rowHeader: true, figure: true, cell: (r) => r.revision },
                { key: "tier", header: "Tier", cell: (r) => <TierBadge tier={r.tier as Tier} size="sm" /> },
                {
                  key: "by",
                  header: "Saved",
                  cell: (r) => (
                    <>
                      <time dateTime={isoDate(r.createdAt)}>{formatDateTime(r.createdAt, timeZone)}</time>
                      <span className="block text-xs text-stone-600">{r.createdByName}</span>
                    </>
                  ),
                },
              ]}
            />
          </Card>
        </div>
      </div>
    </>
  );
}
