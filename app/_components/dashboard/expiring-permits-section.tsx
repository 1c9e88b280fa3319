import Link from "next/link";
import { Card } from "../card";
import { cx } from "../cx";
import { daysUntil, formatDate, isoDate, relativeDays } from "../format";
import { TierBadge } from "../tier-badge";
import type { ExpiringPermitSummary } from "./types";

type ExpiringPermitsSectionProps = {
  permits: readonly ExpiringPermitSummary[];
  /** How far ahead "soon" looks, in days; shown in the description. */
  withinDays?: number;
  /** For tests; defaults to the time of rendering. */
  now?: Date;
};

export function ExpiringPermitsSection({ permits, withinDays = 30, now }: ExpiringPermitsSectionProps) {
  return (
    <Card
      title="Permits expiring soon"
      description={`Active permits that end within ${withinDays} days.`}
      flush
      actions={
        <Link href="/permits" className="text-sm font-medium text-ink-700 hover:text-ink-900">
          All permits
        </Link>
      }
    >
      {permits.length === 0 ? (
        <p className="px-4 py-6 text-sm text-stone-600">No permits expire in the next {withinDays} days.</p>
      ) : (
        <ul className="divide-y divide-stone-100">
          {permits.map((p) => {
            const days = daysUntil(p.validUntil, now);
            return (
              <li key={p.id} className="flex flex-col gap-1.5 px-4 py-3">
                <div className="flex items-baseline justify-between gap-3">
                  <Link
                    href={`/permits/${p.id}`}
                    className="figure text-sm font-medium text-ink-800 underline decoration-ink-300 hover:decoration-ink-700"
                  >
                    {p.number}
                  </Link>
                  <span
                    className={cx(
                      "text-sm whitespace-nowrap",
                      days <= 7 ? "font-semibold text-stone-900" : "text-stone-600",
                    )}
                  >
                    ends <time dateTime={isoDate(p.validUntil)}>{formatDate(p.validUntil)}</time>
                    <span className="text-stone-600"> ({relativeDays(days)})</span>
                  </span>
                </div>
                <p className="text-sm text-stone-800">
                  {p.title}
                  {p.room && <span className="text-stone-600"> · {p.room}</span>}
                </p>
                <TierBadge tier={p.tier} size="sm" className="self-start" />
              </li>
            );
          })}
        </ul>
      )}
    </Card>
  );
}
