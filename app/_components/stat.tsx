import type { ReactNode } from "react";
import { cx } from "./cx";

type StatListProps = { children: ReactNode; className?: string };

/** A description list of figures; put <Stat> items inside. */
export function StatList({ children, className }: StatListProps) {
  return (
    <dl className={cx("grid grid-cols-2 gap-x-6 gap-y-4 sm:grid-cols-3 lg:grid-cols-4", className)}>{children}</dl>
  );
}

type StatProps = {
  label: ReactNode;
  /** The number as it should read, already rounded (three significant digits), e.g. "1.47". */
  value: ReactNode;
  /** SI unit with prefix, e.g. "kV", "nF", "J". */
  unit?: string;
  /** A line under the figure: the formula, a threshold, or a source. */
  hint?: ReactNode;
  size?: "sm" | "md" | "lg";
  className?: string;
};

const valueSize = { sm: "text-base", md: "text-xl", lg: "text-3xl" } as const;

/** A labelled figure. Must sit inside <StatList> (it renders dt/dd). */
export function Stat({ label, value, unit, hint, size = "md", className }: StatProps) {
  return (
    <div className={cx("min-w-0", className)}>
      <dt className="text-xs font-medium tracking-wide text-stone-600 uppercase">{label}</dt>
      <dd className="mt-0.5">
        <span className={cx("figure font-medium text-stone-900", valueSize[size])}>
          {value}
          {unit && <span className="ml-[0.25em] text-[0.8em] font-normal text-stone-600">{unit}</span>}
        </span>
        {hint && <span className="mt-0.5 block text-xs text-stone-600">{hint}</span>}
      </dd>
    </div>
  );
}
