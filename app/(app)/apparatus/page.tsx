import type { Metadata } from "next";
import Link from "next/link";
import { ButtonLink } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { DataTable, type Column } from "@/app/_components/data-table";
import { controlClasses } from "@/app/_components/field";
import { formatDate, isoDate } from "@/app/_components/format";
import { PageHeader } from "@/app/_components/page-header";
import type { Tier } from "@/app/_components/tier";
import { TierFilter } from "@/app/_components/tier-filter";
import { TierBadge } from "@/app/_components/tier-badge";
import { listApparatus, type ApparatusListRow } from "@/lib/apparatus/queries";
import { can, requirePageUser } from "@/lib/auth/guards";
import { formatQuantity } from "@/lib/hazard";
import { apparatusListQuerySchema } from "@/lib/apparatus/schemas";
import { Pager, SortLink } from "@/app/_components/list-controls";

export const metadata: Metadata = { title: "Apparatus" };

type PageProps = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function ApparatusListPage({ searchParams }: PageProps) {
  const user = await requirePageUser("apparatus.read", "/apparatus");
  const raw = await searchParams;
  // A hand-edited query string falls back to the defaults rather than failing the page.
  const parsed = apparatusListQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : apparatusListQuerySchema.parse({});
  const result = await listApparatus(user, query);
  const params = {
    q: query.q || undefined,
    tier: query.tier,
    owner: query.owner === "all" ? undefined : query.owner,
    sort: query.sort,
    dir: query.dir,
    pageSize: query.pageSize === 20 ? undefined : query.pageSize,
  };
  const sortHeader = (column: (typeof query)["sort"], label: string, firstDir: "asc" | "desc" = "asc") => (
    <SortLink base="/apparatus" params={params} column={column} label={label} firstDir={firstDir} />
  );

  const columns: Column<ApparatusListRow>[] = [
    {
      key: "name",
      header: sortHeader("name", "Name"),
      rowHeader: true,
      cell: (a) => (
        <>
          <Link
            href={`/apparatus/${a.id}`}
            className="text-ink-800 underline decoration-ink-300 hover:decoration-ink-700"
          >
            {a.name}
          </Link>
          <span className="block text-xs font-normal text-stone-600">
            Revision {a.currentRevision} · {a.ownerName}
            {a.retiredAt ? " · Retired" : ""}
          </span>
        </>
      ),
    },
    { key: "room", header: sortHeader("room", "Room"), cell: (a) => a.room },
    { key: "department", header: "Department", hideBelow: "lg", cell: (a) => a.departmentName },
    {
      key: "tier",
      header: sortHeader("tier", "Tier", "desc"),
      cell: (a) => <TierBadge tier={a.tier as Tier} size="sm" />,
    },
    {
      key: "energy",
      header: sortHeader("energy", "Energy", "desc"),
      align: "right",
      figure: true,
      hideBelow: "sm",
      cell: (a) => formatQuantity(a.energy_J, "J"),
    },
    {
      key: "updated",
      header: sortHeader("updated", "Updated", "desc"),
      align: "right",
      hideBelow: "md",
      cell: (a) => (
        <time dateTime={isoDate(a.updatedAt)} className="whitespace-nowrap text-stone-600">
          {formatDate(a.updatedAt)}
        </time>
      ),
    },
  ];

  return (
    <>
      <PageHeader
        title="Apparatus"
        description="Registered set-ups with their energy sources, spark gaps and current tier. Every edit is kept as a revision."
        actions={
          can(user, "apparatus.write") ? <ButtonLink href="/apparatus/new">Register apparatus</ButtonLink> : undefined
        }
      />
      <Card flush>
        <form
          method="get"
          action="/apparatus"
          className="flex flex-wrap items-end gap-3 border-b border-stone-200 px-4 py-3"
        >
          <div className="flex min-w-48 flex-1 flex-col">
            <label htmlFor="apparatus-q" className="text-sm font-medium text-stone-800">
              Search
            </label>
            <input
              id="apparatus-q"
              name="q"
              type="search"
              defaultValue={query.q}
              maxLength={100}
              placeholder="Name, room or notes"
              className={`${controlClasses} mt-1`}
            />
          </div>
          <div className="flex flex-col">
            <label htmlFor="apparatus-tier" className="text-sm font-medium text-stone-800">
              Tier
            </label>
            <TierFilter id="apparatus-tier" value={query.tier} named />
          </div>
          <div className="flex flex-col">
            <label htmlFor="apparatus-owner" className="text-sm font-medium text-stone-800">
              Owner
            </label>
            <select id="apparatus-owner" name="owner" defaultValue={query.owner} className={`${controlClasses} mt-1`}>
              <option value="all">Everyone I can see</option>
              <option value="mine">Mine</option>
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
        {!parsed.success && (
          <p className="border-b border-stone-200 px-4 py-2 text-sm text-stone-700">
            Some filters in the address were not understood and were reset.
          </p>
        )}
        <DataTable
          caption="Registered apparatus"
          columns={columns}
          rows={result.rows}
          rowKey={(a) => a.id}
          empty={
            query.q || query.tier !== undefined ? "No apparatus matches these filters." : "No apparatus registered yet."
          }
        />
        <Pager
          base="/apparatus"
          params={params}
          page={result.page}
          pageSize={result.pageSize}
          total={result.total}
          noun="apparatus"
        />
      </Card>
    </>
  );
}
