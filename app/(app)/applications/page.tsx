import type { Metadata } from "next";
import Link from "next/link";
import { ButtonLink } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { DataTable, type Column } from "@/app/_components/data-table";
import { controlClasses } from "@/app/_components/field";
import { formatDate, isoDate } from "@/app/_components/format";
import { PageHeader } from "@/app/_components/page-header";
import { APPLICATION_STATE_LABELS, StateBadge } from "@/app/_components/state-badge";
import type { Tier } from "@/app/_components/tier";
import { TierBadge } from "@/app/_components/tier-badge";
import { isEditable } from "@/lib/applications/access";
import { listMyApplications, type MyApplicationRow } from "@/lib/applications/queries";
import { can, requirePageUser } from "@/lib/auth/guards";
import { applicationListQuerySchema } from "@/lib/applications/schemas";
import { Pager, SortLink } from "@/app/_components/list-controls";
import { DuplicateButton } from "./new/_form/duplicate-button";

export const metadata: Metadata = { title: "Applications" };

type PageProps = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function ApplicationsPage({ searchParams }: PageProps) {
  const user = await requirePageUser(undefined, "/applications");
  const parsed = applicationListQuerySchema.safeParse(await searchParams);
  const query = parsed.success ? parsed.data : applicationListQuerySchema.parse({});
  const result = await listMyApplications(user, query);
  const creator = can(user, "application.create");
  const params = {
    state: query.state,
    sort: query.sort,
    dir: query.dir,
    pageSize: query.pageSize === 20 ? undefined : query.pageSize,
  };
  const sortHeader = (column: (typeof query)["sort"], label: string, firstDir: "asc" | "desc" = "asc") => (
    <SortLink base="/applications" params={params} column={column} label={label} firstDir={firstDir} />
  );

  const columns: Column<MyApplicationRow>[] = [
    {
      key: "title",
      header: sortHeader("title", "Application"),
      rowHeader: true,
      cell: (a) => (
        <>
          <Link
            href={isEditable(a.state) ? `/applications/${a.id}/edit` : `/applications/${a.id}`}
            className="text-ink-800 underline decoration-ink-300 hover:decoration-ink-700"
          >
            {a.title || "Untitled application"}
          </Link>
          <span className="block text-xs font-normal text-stone-600">
            A-{a.seq}
            {a.apparatusName ? ` · ${a.apparatusName}` : ""}
          </span>
        </>
      ),
    },
    {
      key: "state",
      header: sortHeader("state", "State"),
      cell: (a) => <StateBadge kind="application" state={a.state} />,
    },
    {
      key: "tier",
      header: sortHeader("tier", "Tier", "desc"),
      hideBelow: "sm",
      cell: (a) =>
        a.tier === null ? (
          <span className="text-stone-500">Not assessed</span>
        ) : (
          <TierBadge tier={a.tier as Tier} size="sm" />
        ),
    },
    {
      key: "submitted",
      header: sortHeader("submitted", "Submitted", "desc"),
      hideBelow: "md",
      cell: (a) =>
        a.submittedAt ? (
          <time dateTime={isoDate(a.submittedAt)} className="whitespace-nowrap">
            {formatDate(a.submittedAt)}
          </time>
        ) : (
          <span className="text-stone-500">—</span>
        ),
    },
    {
      key: "updated",
      header: sortHeader("updated", "Last change", "desc"),
      hideBelow: "lg",
      cell: (a) => (
        <time dateTime={isoDate(a.updatedAt)} className="whitespace-nowrap text-stone-600">
          {formatDate(a.updatedAt)}
        </time>
      ),
    },
    {
      key: "actions",
      header: <span className="sr-only">Actions</span>,
      align: "right",
      cell: (a) =>
        creator ? <DuplicateButton applicationId={a.id} title={a.title || "Untitled application"} /> : null,
    },
  ];

  return (
    <>
      <PageHeader
        title="My applications"
        description="Drafts, applications under review and decided ones. Duplicate one for the next run of the same demonstration."
        actions={creator ? <ButtonLink href="/applications/new">New application</ButtonLink> : undefined}
      />
      <Card flush>
        <form
          method="get"
          action="/applications"
          className="flex flex-wrap items-end gap-3 border-b border-stone-200 px-4 py-3"
        >
          <div className="flex flex-col">
            <label htmlFor="applications-state" className="text-sm font-medium text-stone-800">
              State
            </label>
            <select
              id="applications-state"
              name="state"
              defaultValue={query.state ?? ""}
              className={`${controlClasses} mt-1`}
            >
              <option value="">Any state</option>
              {Object.entries(APPLICATION_STATE_LABELS).map(([value, label]) => (
                <option key={value} value={value}>
                  {label}
                </option>
              ))}
            </select>
          </div>
          <input type="hidden" name="sort" value={query.sort} />
          <input type="hidden" name="dir" value={query.dir} />
          <button
            type="submit"
            className="h-10 rounded-md border border-stone-300 bg-white px-3.5 text-sm font-medium text-stone-800 shadow-xs hover:bg-stone-50"
          >
            Filter
          </button>
        </form>
        <DataTable
          caption="My applications"
          columns={columns}
          rows={result.rows}
          rowKey={(a) => a.id}
          empty={query.state ? "No applications in this state." : "No applications yet."}
        />
        <Pager
          base="/applications"
          params={params}
          page={result.page}
          pageSize={result.pageSize}
          total={result.total}
          noun="applications"
        />
      </Card>
    </>
  );
}
