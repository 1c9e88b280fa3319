import Link from "next/link";

type PaginationProps = {
  page: number;
  pageSize: number;
  total: number;
  /** Builds the URL of a page, keeping the current filters. */
  href: (page: number) => string;
  noun: [singular: string, plural: string];
  /** `total` is a lower bound: there are more than that (a capped count). */
  more?: boolean;
  /** Whether a next page exists, where the total alone cannot say (a capped count). */
  hasNext?: boolean;
};

/** Previous / next links for a server-paginated list, with where the reader is. */
export function Pagination({ page, pageSize, total, href, noun, more = false, hasNext }: PaginationProps) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const next = hasNext ?? page < pages;
  const link =
    "rounded-md border border-stone-300 bg-white px-3 py-1.5 text-sm font-medium text-ink-800 no-underline hover:bg-stone-50";
  return (
    <nav
      aria-label="Pages"
      className="flex flex-wrap items-center justify-between gap-3 border-t border-stone-200 px-4 py-3 text-sm"
    >
      <p className="text-stone-600">
        {more ? (
          <>
            Page <span className="figure">{page}</span> · more than <span className="figure">{total}</span> {noun[1]}
          </>
        ) : (
          <>
            Page <span className="figure">{Math.min(page, pages)}</span> of <span className="figure">{pages}</span> ·{" "}
            <span className="figure">{total}</span> {total === 1 ? noun[0] : noun[1]}
          </>
        )}
      </p>
      <div className="flex gap-2">
        {page > 1 ? (
          <Link href={href(page - 1)} className={link} rel="prev">
            Previous
          </Link>
        ) : (
          <span aria-disabled="true" className={`${link} cursor-not-allowed opacity-50`}>
            Previous
          </span>
        )}
        {next ? (
          <Link href={href(page + 1)} className={link} rel="next">
            Next
          </Link>
        ) : (
          <span aria-disabled="true" className={`${link} cursor-not-allowed opacity-50`}>
            Next
          </span>
        )}
      </div>
    </nav>
  );
}
