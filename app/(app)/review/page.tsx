import type { Metadata } from "next";
import Link from "next/link";
import { Alert } from "@/app/_components/alert";
import { buttonClasses } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { DataTable, type Column } from "@/app/_components/data-table";
import { controlClasses } from "@/app/_components/field";
import { formatDate, isoDate } from "@/app/_components/format";
import { PageHeader } from "@/app/_components/page-header";
import { StateBadge } from "@/app/_components/state-badge";
import { TIERS, isTier } from "@/app/_components/tier";
import { TierFilter } from "@/app/_components/tier-filter";
import { TierBadge } from "@/app/_components/tier-badge";
import { can, requirePageUser } from "@/lib/auth/guards";
import { cappedCount, cappedSum } from "@/lib/review/counts";
import { listQueue, queueCountsByTier, type QueueRow } from "@/lib/review/queries";
import { queueQuerySchema, type QueueQuery } from "@/lib/review/schemas";
import { STEP_ROLE_LABELS } from "@/lib/rules/chain";
import { listDepartments } from "@/lib/users/queries";
import { Pagination } from "@/app/_components/pagination";
import { daysWaiting, waitingText } from "@/app/_components/utc";

export const metadata: Metadata = { title: "Review queue" };

const AGE_OPTIONS = [
  { value: "", label: "Any time" },
  { value: "1", label: "1 day or more" },
  { value: "3", label: "3 days or more" },
  { value: "7", label: "7 days or more" },
  { value: "14", label: "14 days or more" },
  { value: "30", label: "30 days or more" },
];

function queryString(q: Partial<QueueQuery>, page?: number): string {
  const params = new URLSearchParams();
  if (q.scope && q.scope !== "mine") params.set("scope", q.scope);
  if (q.tier !== undefined) params.set("tier", String(q.tier));
  if (q.department) params.set("department", q.department);
  if (q.state) params.set("state", q.state);
  if (q.age) params.set("age", String(q.age));
  if (page && page > 1) params.set("page", String(page));
  const s = params.toString();
  return s ? `?${s}` : "";
}

function columns(now: Date): Column<QueueRow>[] {
  return [
    {
      key: "title",
      header: "Application",
      rowHeader: true,
      cell: (r) => (
        <>
          <Link
            href={`/applications/${r.id}`}
            className="text-ink-800 underline decoration-ink-300 hover:decoration-ink-700"
          >
            {r.title || "Untitled application"}
          </Link>
          <span className="figure block text-xs font-normal text-stone-600">A-{r.seq}</span>
        </>
      ),
    },
    {
      key: "tier",
      header: "Tier",
      cell: (r) => (isTier(r.tier) ? <TierBadge tier={r.tier} size="sm" /> : <span className="text-stone-500">—</span>),
    },
    { key: "state", header: "State", hideBelow: "sm", cell: (r) => <StateBadge kind="application" state={r.state} /> },
    {
      key: "waitingFor",
      header: "Waiting for",
      cell: (r) =>
        r.pendingRole ? (
          <span className="whitespace-nowrap">
            {STEP_ROLE_LABELS[r.pendingRole]}
            <span className="text-stone-600"> · step {r.chainStep + 1}</span>
            {r.actionable && (
              <span className="ml-1.5 rounded bg-ink-50 px-1.5 py-px text-xs font-medium text-ink-800">you</span>
            )}
          </span>
        ) : (
          <span className="text-stone-600">No review: self-certified</span>
        ),
    },
    { key: "department", header: "Department", hideBelow: "md", cell: (r) => r.departmentName },
    { key: "applicant", header: "Applicant", hideBelow: "lg", cell: (r) => r.applicantName },
    {
      key: "waiting",
      header: "Waiting",
      align: "right",
      figure: true,
      cell: (r) =>
        r.waitingSince ? (
          <span title={`since ${formatDate(r.waitingSince)}`}>
            <time dateTime={isoDate(r.waitingSince)}>{waitingText(daysWaiting(r.waitingSince, now))}</time>
          </span>
        ) : (
          "—"
        ),
    },
  ];
}

export default async function ReviewQueuePage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePageUser("application.review", "/review");
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const parsed = queueQuerySchema.safeParse(raw);
  const query: QueueQuery = parsed.success ? parsed.data : { scope: "mine", page: 1 };
  const seesAll = can(user, "application.review.any");
  const now = new Date();
  const [queue, counts, departments] = await Promise.all([
    listQueue(
      user,
      {
        tier: query.tier,
        departmentId: query.department,
        state: query.state,
        minAgeDays: query.age,
        scope: query.scope,
        page: query.page,
      },
      now,
    ),
    queueCountsByTier(user),
    seesAll ? listDepartments() : Promise.resolve([]),
  ]);
  const total = cappedSum(counts);

  return (
    <>
      <PageHeader
        title="Review queue"
        description={
          seesAll
            ? "Applications waiting for a signature, oldest wait first. Safety officers see every department."
            : "Applications of your department waiting for a signature, oldest wait first."
        }
      />
      {!parsed.success && (
        <Alert tone="warn" title="Some filters were not understood" className="mb-4">
          The queue shows every application waiting for you instead.
        </Alert>
      )}

      <section aria-labelledby="counts-heading" className="mb-6">
        <h2 id="counts-heading" className="mb-2 text-sm font-medium text-stone-700">
          Waiting for your signature: <span className="figure">{total.label}</span>
        </h2>
        <ul className="flex flex-wrap gap-2">
          {TIERS.map((t) => (
            <li key={t}>
              <Link href={`/review${queryString({ tier: t })}`} className="no-underline">
                <TierBadge tier={t} count={cappedCount(counts[t])} countNoun="waiting for you" />
              </Link>
            </li>
          ))}
        </ul>
      </section>

      <Card flush>
        <form
          method="get"
          action="/review"
          className="grid gap-3 border-b border-stone-200 px-4 py-3 sm:grid-cols-3 lg:grid-cols-6 lg:items-end"
        >
          <label className="flex flex-col text-sm font-medium text-stone-800">
            Waiting for
            <select name="scope" defaultValue={query.scope} className={`${controlClasses} mt-1`}>
              <option value="mine">You</option>
              <option value="all">Anyone</option>
            </select>
          </label>
          <label className="flex flex-col text-sm font-medium text-stone-800">
            Tier
            <TierFilter value={query.tier} />
          </label>
          {seesAll && (
            <label className="flex flex-col text-sm font-medium text-stone-800">
              Department
              <select name="department" defaultValue={query.department ?? ""} className={`${controlClasses} mt-1`}>
                <option value="">Every department</option>
                {departments.map((d) => (
                  <option key={d.id} value={d.id}>
                    {d.name}
                  </option>
                ))}
              </select>
            </label>
          )}
          <label className="flex flex-col text-sm font-medium text-stone-800">
            State
            <select name="state" defaultValue={query.state ?? ""} className={`${controlClasses} mt-1`}>
              <option value="">Submitted or in review</option>
              <option value="submitted">Submitted</option>
              <option value="in_review">In review</option>
            </select>
          </label>
          <label className="flex flex-col text-sm font-medium text-stone-800">
            Waiting
            <select name="age" defaultValue={query.age ? String(query.age) : ""} className={`${controlClasses} mt-1`}>
              {AGE_OPTIONS.map((o) => (
                <option key={o.value} value={o.value}>
                  {o.label}
                </option>
              ))}
            </select>
          </label>
          <div className="flex gap-2">
            <button type="submit" className={buttonClasses()}>
              Filter
            </button>
            <Link href="/review" className={buttonClasses({ variant: "secondary" })}>
              Clear
            </Link>
          </div>
        </form>
        <DataTable
          caption="Applications waiting for review"
          columns={columns(now)}
          rows={queue.rows}
          rowKey={(r) => r.id}
          empty={
            query.scope === "mine"
              ? "Nothing waits for your signature with these filters."
              : "Nothing waits with these filters."
          }
        />
        <Pagination
          page={queue.page}
          pageSize={queue.pageSize}
          total={queue.total}
          more={queue.more}
          hasNext={queue.hasNext}
          href={(p) => `/review${queryString(query, p)}`}
          noun={["application", "applications"]}
        />
      </Card>
    </>
  );
}
