import type { ReactNode } from "react";
import { cx } from "./cx";

export type Column<T> = {
  /** Unique within the table. */
  key: string;
  header: ReactNode;
  cell: (row: T) => ReactNode;
  align?: "left" | "right";
  /** Render the cell as a figure: mono, tabular digits. */
  figure?: boolean;
  /** Mark this column's cells as row headers (usually the name or number column). */
  rowHeader?: boolean;
  /** Hide the column on screens narrower than this breakpoint; keep the essentials visible. */
  hideBelow?: "sm" | "md" | "lg";
  className?: string;
};

type DataTableProps<T> = {
  columns: readonly Column<T>[];
  rows: readonly T[];
  rowKey: (row: T) => string;
  /** Names the table for screen readers; shown only when captionVisible. */
  caption: string;
  captionVisible?: boolean;
  /** Shown instead of the table when there are no rows. */
  empty?: ReactNode;
  className?: string;
};

const hide: Record<NonNullable<Column<unknown>["hideBelow"]>, string> = {
  sm: "hidden sm:table-cell",
  md: "hidden md:table-cell",
  lg: "hidden lg:table-cell",
};

/** A plain, server-rendered table. Sorting and paging belong to the page's URL, not to this component. */
export function DataTable<T>({
  columns,
  rows,
  rowKey,
  caption,
  captionVisible = false,
  empty = "Nothing to show.",
  className,
}: DataTableProps<T>) {
  if (rows.length === 0) {
    return <div className={cx("px-4 py-6 text-sm text-stone-600", className)}>{empty}</div>;
  }
  return (
    <div
      // Focusable so keyboard users can scroll a table wider than the screen; a group, not a region,
      // so it does not add a landmark named like the card around it.
      role="group"
      aria-label={caption}
      tabIndex={0}
      className={cx("overflow-x-auto", className)}
    >
      <table className="w-full border-collapse text-left text-sm">
        <caption className={captionVisible ? "px-4 py-2 text-left text-sm font-medium text-stone-700" : "sr-only"}>
          {caption}
        </caption>
        <thead>
          <tr className="border-b border-stone-200 bg-stone-50">
            {columns.map((col) => (
              <th
                key={col.key}
                scope="col"
                className={cx(
                  "px-4 py-2 text-xs font-medium tracking-wide whitespace-nowrap text-stone-600 uppercase",
                  col.align === "right" && "text-right",
                  col.hideBelow && hide[col.hideBelow],
                  col.className,
                )}
              >
                {col.header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody className="divide-y divide-stone-100">
          {rows.map((row) => (
            <tr key={rowKey(row)} className="align-top hover:bg-stone-50/70">
              {columns.map((col) => {
                const Cell = col.rowHeader ? "th" : "td";
                return (
                  <Cell
                    key={col.key}
                    scope={col.rowHeader ? "row" : undefined}
                    className={cx(
                      "px-4 py-2.5 text-stone-800",
                      col.rowHeader && "font-medium text-stone-900",
                      col.align === "right" && "text-right",
                      col.figure && "figure whitespace-nowrap",
                      col.hideBelow && hide[col.hideBelow],
                      col.className,
                    )}
                  >
                    {col.cell(row)}
                  </Cell>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
