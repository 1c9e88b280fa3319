import Link from "next/link";
import { Card } from "../card";
import { TIERS } from "../tier";
import { TierBadge } from "../tier-badge";
import { cappedCount, cappedSum } from "@/lib/review/counts";
import type { TierCounts } from "./types";

type ReviewQueueSectionProps = {
  /** Applications waiting for this user's decision, by tier (capped: lib/review/counts); missing tiers count as 0. */
  counts: TierCounts;
};

export function ReviewQueueSection({ counts }: ReviewQueueSectionProps) {
  const total = cappedSum(counts);
  return (
    <Card
      title="Review queue by tier"
      description={
        total.n === 0 ? (
          "Nothing waiting."
        ) : (
          <>
            <span className="figure font-medium text-stone-900">{total.label}</span>{" "}
            {total.label === "1" ? "application waits" : "applications wait"} for your decision.
          </>
        )
      }
      flush
      actions={
        <Link href="/review" className="text-sm font-medium text-ink-700 hover:text-ink-900">
          Open queue
        </Link>
      }
    >
      <ul className="divide-y divide-stone-100">
        {TIERS.map((tier) => {
          const n = counts[tier] ?? 0;
          return (
            <li key={tier} className="flex items-center justify-between gap-3 px-4 py-2">
              <TierBadge tier={tier} size="sm" />
              {n > 0 ? (
                <Link
                  href={`/review?tier=${tier}`}
                  className="figure min-w-8 rounded px-1.5 text-right text-base font-medium text-ink-800 underline decoration-ink-300 hover:decoration-ink-700"
                >
                  {cappedCount(n)}
                  <span className="sr-only"> waiting at tier {tier}</span>
                </Link>
              ) : (
                <span className="figure min-w-8 px-1.5 text-right text-base text-stone-500">
                  0<span className="sr-only"> waiting at tier {tier}</span>
                </span>
              )}
            </li>
          );
        })}
      </ul>
    </Card>
  );
}
