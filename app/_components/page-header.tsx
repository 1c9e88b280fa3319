import type { ReactNode } from "react";
import { cx } from "./cx";

type PageHeaderProps = {
  title: ReactNode;
  description?: ReactNode;
  /** Buttons or links aligned to the right on wide screens, below the title on phones. */
  actions?: ReactNode;
  /** A small line above the title: a back link, a breadcrumb, or a record number. */
  eyebrow?: ReactNode;
  className?: string;
};

/** The page's one h1, with its description and actions. */
export function PageHeader({ title, description, actions, eyebrow, className }: PageHeaderProps) {
  return (
    <header className={cx("mb-6 flex flex-col gap-3 sm:flex-row sm:items-end sm:justify-between", className)}>
      <div className="min-w-0">
        {eyebrow && <div className="mb-1 text-sm text-stone-600">{eyebrow}</div>}
        <h1 className="text-2xl font-semibold tracking-tight text-stone-900">{title}</h1>
        {description && <div className="mt-1 max-w-prose text-sm text-stone-600">{description}</div>}
      </div>
      {actions && <div className="flex shrink-0 flex-wrap items-center gap-2">{actions}</div>}
    </header>
  );
}
