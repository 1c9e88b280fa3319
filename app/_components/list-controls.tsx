import Link from "next/link";

// Server-rendered sorting links and pager for lists whose state lives in the URL's query string.

type Params = Record<string, string | number | undefined>;

export function hrefWith(base: string, params: Params, change: Params): string {
  const merged = { ...params, ...change };
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(merged)) {
    if (value !== undefined && value !== "") search.set(key, String(value));
  }
  const text = search.toString();
  return text ? `${base}?${text}` : base;
}

type SortLinkProps = {
  base: string;
  params: Params & { sort: string; dir: "asc" | "desc" };
  column: string;
  label: string;
  /** The direction a first click sorts in. */
  firstDir?: "asc" | "desc";
};

/** A column header that sorts by this column, or flips the direction when it already does. */
export function SortLink({ base, params, column, label, firstDir = "asc" }: SortLinkProps) {
  const active = params.sort === column;
  const nextDir = active ? (params.dir === "asc" ? "desc" : "asc") : firstDir;
  return (
    <Link
      href={hrefWith(base, params, { sort: column, dir: nextDir, page: undefined })}
      className="inline-flex items-center gap-1 text-stone-700 underline decoration-stone-300 hover:text-stone-900"
      aria-current={active ? "true" : undefined}
    >
      {label}
      {active && (
        <>
          <span aria-hidden="true">{params.dir === "asc" ? "↑" : "↓"}</span>
          <span className="sr-only">{params.dir === "asc" ? "(sorted ascending)" : "(sorted descending)"}</span>
        </>
      )}
    </Link>
  );
}

type PagerProps = { base: string; params: Params; page: number; pageSize: number; total: number; noun: string };

export function Pager({ base, params, page, pageSize, total, noun }: PagerProps) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const from = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const to = Math.min(total, page * pageSize);
  return (
    <nav
      aria-label="Pages"
      className="flex flex-wrap items-center justify-between gap-3 px-4 py-3 text-sm text-stone-700"
    >
      <p>
        {total === 0 ? (
          `No ${noun}.`
        ) : (
          <>
            <span className="figure">{from}</span>–<span className="figure">{to}</span> of{" "}
            <span className="figure">{total}</span> {noun}
          </>
        )}
      </p>
      <div className="flex items-center gap-2">
        {page > 1 ? (
          <Link
            className="rounded-md border border-stone-300 bg-white px-2.5 py-1 hover:bg-stone-50"
            href={hrefWith(base, params, { page: page - 1 })}
          >
            Previous<span className="sr-only"> page</span>
          </Link>
        ) : (
          <span aria-disabled="true" className="rounded-md border border-stone-200 px-2.5 py-1 text-stone-500">
            Previous<span className="sr-only"> page</span>
          </span>
        )}
        <span>
          Page <span className="figure">{Math.min(page, pages)}</span> of <span className="figure">{pages}</span>
        </span>
        {page < pages ? (
          <Link
            className="rounded-md border border-stone-300 bg-white px-2.5 py-1 hover:bg-stone-50"
            href={hrefWith(base, params, { page: page + 1 })}
          >
            Next<span className="sr-only"> page</span>
          </Link>
        ) : (
          <span aria-disabled="true" className="rounded-md border border-stone-200 px-2.5 py-1 text-stone-500">
            Next<span className="sr-only"> page</span>
          </span>
        )}
      </div>
    </nav>
  );
}
