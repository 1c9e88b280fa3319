import type { Metadata } from "next";
import Link from "next/link";
import type { ReactNode } from "react";
import { Alert } from "@/app/_components/alert";
import { Card } from "@/app/_components/card";
import { PageHeader } from "@/app/_components/page-header";
import { SearchForm } from "@/app/_components/search-form";
import { StateBadge } from "@/app/_components/state-badge";
import { isTier } from "@/app/_components/tier";
import { TierBadge } from "@/app/_components/tier-badge";
import { requirePageUser } from "@/lib/auth/guards";
import { ROLE_LABELS } from "@/lib/roles";
import { emptyResults, search, SEARCH_LIMIT, type Group } from "@/lib/search/queries";
import { searchQuerySchema } from "@/lib/search/schemas";

export const metadata: Metadata = { title: "Search" };

// GET /search?q=… — the header's search box lands here: results grouped by kind, each a list of
// links, so a keyboard reaches every result with Tab. Only what the signed-in person may see.

const linkClass = "text-ink-800 underline decoration-ink-300 hover:decoration-ink-700";

function Section<T extends { id: string }>({
  title,
  group,
  render,
  testId,
}: {
  title: string;
  group: Group<T>;
  render: (row: T) => ReactNode;
  testId: string;
}) {
  const count = group.more ? `more than ${SEARCH_LIMIT}` : String(group.rows.length);
  return (
    <Card title={`${title} (${count})`} className="min-w-0">
      {group.rows.length === 0 ? (
        <p className="text-sm text-stone-600">No {title.toLowerCase()} match.</p>
      ) : (
        <ul className="flex flex-col divide-y divide-stone-100" data-testid={testId}>
          {group.rows.map((row) => (
            <li key={row.id} className="py-2 text-sm" data-id={row.id}>
              {render(row)}
            </li>
          ))}
        </ul>
      )}
      {group.more && (
        <p className="mt-2 text-xs text-stone-600">Showing the best {SEARCH_LIMIT}; add a word to narrow the search.</p>
      )}
    </Card>
  );
}

export default async function SearchPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePageUser("search", "/search");
  const raw = (await searchParams).q;
  const text = Array.isArray(raw) ? raw[0] : raw;
  const parsed = text === undefined ? null : searchQuerySchema.safeParse({ q: text });
  const error = parsed && !parsed.success ? parsed.error.issues[0]?.message : undefined;
  const results = parsed?.success ? await search(user, parsed.data.q) : emptyResults(text ?? "");
  const total =
    results.permits.rows.length +
    results.applications.rows.length +
    results.apparatus.rows.length +
    results.people.rows.length;

  return (
    <>
      <PageHeader
        title="Search"
        description="Permits by number, title, room or holder; applications by reference, title or applicant; apparatus by name or room; people by name. Only what you may open is listed."
      />
      <div className="mb-6 max-w-xl">
        <SearchForm defaultValue={text ?? ""} error={error} variant="page" />
      </div>
      {parsed?.success && (
        <>
          <p className="mb-4 text-sm text-stone-700" aria-live="polite">
            {total === 0 ? `Nothing you may see matches “${results.q}”.` : `Results for “${results.q}”.`}
          </p>
          {total > 0 && (
            <div className="grid gap-6 lg:grid-cols-2">
              <Section
                title="Permits"
                testId="search-permits"
                group={results.permits}
                render={(p) => (
                  <div className="flex flex-wrap items-center gap-x-2 gap-y-1">
                    <Link href={`/permits/${p.id}`} className={`figure ${linkClass}`}>
                      {p.number}
                    </Link>
                    {isTier(p.tier) && <TierBadge tier={p.tier} size="sm" />}
                    <StateBadge kind="permit" state={p.state} />
                    <span className="block w-full text-xs text-stone-600">
                      {p.title}
                      {p.room ? ` · ${p.room}` : ""} · {p.holderName}
                    </span>
                  </div>
                )}
              />
              <Section
                title="Applications"
                testId="search-applications"
                group={results.applications}
                render={(a) => (
                  <div className="flex flex-wrap items-center gap-x-2 gap-y-1">
                    <Link href={`/applications/${a.id}`} className={linkClass}>
                      <span className="figure">{a.reference}</span> {a.title || "(untitled draft)"}
                    </Link>
                    {a.tier !== null && isTier(a.tier) && <TierBadge tier={a.tier} size="sm" />}
                    <StateBadge kind="application" state={a.state} />
                    <span className="block w-full text-xs text-stone-600">{a.applicantName}</span>
                  </div>
                )}
              />
              <Section
                title="Apparatus"
                testId="search-apparatus"
                group={results.apparatus}
                render={(x) => (
                  <div className="flex flex-wrap items-center gap-x-2 gap-y-1">
                    <Link href={`/apparatus/${x.id}`} className={linkClass}>
                      {x.name}
                    </Link>
                    {isTier(x.tier) && <TierBadge tier={x.tier} size="sm" />}
                    <span className="block w-full text-xs text-stone-600">
                      {x.room} · {x.departmentName}
                    </span>
                  </div>
                )}
              />
              <Section
                title="People"
                testId="search-people"
                group={results.people}
                render={(u) => (
                  <div>
                    <span className="font-medium text-stone-900">{u.name}</span>
                    {u.disabled && <span className="ml-2 text-xs text-stone-600">(disabled)</span>}
                    <span className="block text-xs text-stone-600">
                      {u.departmentName ?? "No department"}
                      {u.roles && ` · ${u.roles.map((r) => ROLE_LABELS[r]).join(", ")}`}
                      {u.email && ` · ${u.email}`}
                    </span>
                  </div>
                )}
              />
            </div>
          )}
        </>
      )}
      {!parsed && (
        <Alert tone="info">Type a permit number, a title, a room or a name, then press Enter or Search.</Alert>
      )}
    </>
  );
}
