import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { buttonClasses } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { DataTable, type Column } from "@/app/_components/data-table";
import { controlClasses } from "@/app/_components/field";
import { formatDate } from "@/app/_components/format";
import { PageHeader } from "@/app/_components/page-header";
import { StateBadge } from "@/app/_components/state-badge";
import { isTier } from "@/app/_components/tier";
import { TierFilter } from "@/app/_components/tier-filter";
import { TierBadge } from "@/app/_components/tier-badge";
import { can, requirePageUser } from "@/lib/auth/guards";
import { daysFromTo } from "@/lib/permits/dates";
import { listPermits, type PermitListRow } from "@/lib/permits/queries";
import { Pagination } from "@/app/_components/pagination";

export const metadata: Metadata = { title: "Permits" };

const blank = (v: unknown) => (v === "" ? undefined : v);
const filterSchema = z.object({
  state: z.preprocess(blank, z.enum(["active", "expired", "revoked"]).optional()),
  tier: z.preprocess(blank, z.coerce.number().int().min(0).max(4).optional()),
  page: z.preprocess(blank, z.coerce.number().int().min(1).max(100_000).default(1)),
});
type Filters = z.infer<typeof filterSchema>;

function href(f: Filters, page: number): string {
  const p = new URLSearchParams();
  if (f.state) p.set("state", f.state);
  if (f.tier !== undefined) p.set("tier", String(f.tier));
  if (page > 1) p.set("page", String(page));
  const s = p.toString();
  return s ? `/permits?${s}` : "/permits";
}

function columns(today: string): Column<PermitListRow>[] {
  return [
    {
      key: "number",
      header: "Permit",
      rowHeader: true,
      cell: (p) => (
        <>
          <Link
            href={`/permits/${p.id}`}
            className="figure text-ink-800 underline decoration-ink-300 hover:decoration-ink-700"
          >
            {p.number}
          </Link>
          <span className="block text-xs font-normal text-stone-600">
            {p.title}
            {p.room ? ` · ${p.room}` : ""}
          </span>
        </>
      ),
    },
    { key: "tier", header: "Tier", cell: (p) => (isTier(p.tier) ? <TierBadge tier={p.tier} size="sm" /> : p.tier) },
    { key: "state", header: "Status", cell: (p) => <StateBadge kind="permit" state={p.state} /> },
    {
      key: "validity",
      header: "Valid",
      hideBelow: "sm",
      cell: (p) => {
        const left = daysFromTo(today, p.validTo);
        return (
          <span className="whitespace-nowrap">
            {formatDate(p.validFrom)} – {formatDate(p.validTo)}
            {p.state === "active" && (
              <span className="block text-xs text-stone-600">
                {left === 0 ? "last day today" : `${left + 1} days left`}
              </span>
            )}
          </span>
        );
      },
    },
    { key: "holder", header: "Holder", hideBelow: "md", cell: (p) => p.holderName },
    { key: "department", header: "Department", hideBelow: "lg", cell: (p) => p.departmentName },
  ];
}

export default async function PermitsPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePageUser(undefined, "/permits");
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const parsed = filterSchema.safeParse(raw);
  const filters: Filters = parsed.success ? parsed.data : { page: 1 };
  const list = await listPermits(user, filters);
  const officer = can(user, "permit.read.any");
  const exports = can(user, "audit.export");

  return (
    <>
      <PageHeader
        title="Permits"
        description={
          officer
            ? "Every permit of the institution, active ones first, the soonest to end at the top."
            : "Your permits and those you are named on" +
              (can(user, "application.review") ? ", and your department's." : ".")
        }
        actions={
          officer ? (
            <a href="/api/permits/export.csv" className={buttonClasses({ variant: "secondary" })} download>
              Export permits (CSV)
            </a>
          ) : undefined
        }
      />
      <Card flush>
        <form
          method="get"
          action="/permits"
          className="flex flex-wrap items-end gap-3 border-b border-stone-200 px-4 py-3"
        >
          <label className="flex flex-col text-sm font-medium text-stone-800">
            Status
            <select name="state" defaultValue={filters.state ?? ""} className={`${controlClasses} mt-1`}>
              <option value="">Any status</option>
              <option value="active">Active</option>
              <option value="expired">Expired</option>
              <option value="revoked">Revoked</option>
            </select>
          </label>
          <label className="flex flex-col text-sm font-medium text-stone-800">
            Tier
            <TierFilter value={filters.tier} />
          </label>
          <button type="submit" className={buttonClasses()}>
            Filter
          </button>
          <Link href="/permits" className={buttonClasses({ variant: "secondary" })}>
            Clear
          </Link>
        </form>
        <DataTable
          caption="Permits"
          columns={columns(list.today)}
          rows={list.rows}
          rowKey={(p) => p.id}
          empty="No permits with these filters."
        />
        <Pagination
          page={list.page}
          pageSize={list.pageSize}
          total={list.total}
          more={list.more}
          hasNext={list.hasNext}
          href={(p) => href(filters, p)}
          noun={["permit", "permits"]}
        />
      </Card>

      {exports && (
        <Card
          title="Audit trail export"
          description="Every recorded change between two days (UTC), as CSV."
          className="mt-6"
        >
          <form method="get" action="/api/audit/export.csv" className="flex flex-wrap items-end gap-3">
            <label className="flex flex-col text-sm font-medium text-stone-800">
              From
              <input type="date" name="from" className={`${controlClasses} mt-1`} />
            </label>
            <label className="flex flex-col text-sm font-medium text-stone-800">
              To
              <input type="date" name="to" className={`${controlClasses} mt-1`} />
            </label>
            <button type="submit" className={buttonClasses({ variant: "secondary" })}>
              Download CSV
            </button>
          </form>
        </Card>
      )}
    </>
  );
}
