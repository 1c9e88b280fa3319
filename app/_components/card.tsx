import { useId, type ReactNode } from "react";
import { cx } from "./cx";

type CardProps = {
  /** When given, the card is a labelled region with this heading. */
  title?: ReactNode;
  description?: ReactNode;
  /** Small controls in the card's header, e.g. a "View all" link. */
  actions?: ReactNode;
  footer?: ReactNode;
  /** Heading level for the title; 2 on a page under its h1, 3 inside a titled section. */
  headingLevel?: 2 | 3;
  /** Remove the body padding, e.g. for a table that runs edge to edge. */
  flush?: boolean;
  className?: string;
  children?: ReactNode;
};

export function Card({
  title,
  description,
  actions,
  footer,
  headingLevel = 2,
  flush = false,
  className,
  children,
}: CardProps) {
  const headingId = useId();
  const Heading = headingLevel === 2 ? "h2" : "h3";
  const Wrapper = title ? "section" : "div";
  return (
    <Wrapper
      aria-labelledby={title ? headingId : undefined}
      className={cx("flex min-w-0 flex-col rounded-lg border border-stone-200 bg-white shadow-xs", className)}
    >
      {(title || actions) && (
        <div className="flex items-start justify-between gap-3 border-b border-stone-200 px-4 py-3">
          <div className="min-w-0">
            {title && (
              <Heading id={headingId} className="text-base font-semibold text-stone-900">
                {title}
              </Heading>
            )}
            {description && <p className="mt-0.5 text-sm text-stone-600">{description}</p>}
          </div>
          {actions && <div className="flex shrink-0 items-center gap-2 text-sm">{actions}</div>}
        </div>
      )}
      <div className={cx("min-w-0 flex-1", !flush && "px-4 py-3")}>{children}</div>
      {footer && <div className="border-t border-stone-200 px-4 py-2.5 text-sm text-stone-600">{footer}</div>}
    </Wrapper>
  );
}
