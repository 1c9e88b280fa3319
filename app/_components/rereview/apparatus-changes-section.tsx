import Link from "next/link";
import { Card } from "@/app/_components/card";
import { formatDateTime, isoDate } from "@/app/_components/format";
import { isTier } from "@/app/_components/tier";
import { TierBadge } from "@/app/_components/tier-badge";
import type { CurrentUser } from "@/lib/auth/guards";
import { apparatusChangesForHolder } from "@/lib/rereview/queries";
import { institutionTimeZone } from "@/lib/settings/queries";

/** The holder's dashboard: active permits whose apparatus changed since approval. Nothing when none. */
export async function ApparatusChangesSection({ user }: { user: CurrentUser }) {
  const [rows, timeZone] = await Promise.all([apparatusChangesForHolder(user), institutionTimeZone()]);
  if (rows.length === 0) return null;
  return (
    <Card
      title="Apparatus changed since approval"
      description="Your active permits cover these set-ups as approved; run them only that way, or start an amendment."
      flush
    >
      <ul className="divide-y divide-stone-100" data-testid="apparatus-changes">
        {rows.map((r) => (
          <li key={r.permitId} className="flex flex-col gap-1.5 px-4 py-3">
            <div className="flex flex-wrap items-baseline justify-between gap-3">
              <Link
                href={`/permits/${r.permitId}`}
                className="figure text-sm font-medium text-ink-800 underline decoration-ink-300 hover:decoration-ink-700"
              >
                {r.permitNumber}
              </Link>
              <span className="text-sm text-stone-600">
                revision {r.revision},{" "}
                <time dateTime={isoDate(r.changedAt)}>{formatDateTime(r.changedAt, timeZone)}</time>
              </span>
            </div>
            <p className="text-sm text-stone-800">
              {r.title} <span className="text-stone-600">· {r.apparatusName}</span>
            </p>
            <div className="flex flex-wrap items-center gap-2 text-sm">
              {isTier(r.permitTier) && <TierBadge tier={r.permitTier} size="sm" />}
              <span aria-label="now">→</span>
              {isTier(r.tier) && (
                <TierBadge
                  tier={r.tier}
                  size="sm"
                  className={r.tier > r.permitTier ? "ring-2 ring-red-700 ring-offset-1" : undefined}
                />
              )}
              {r.tier > r.permitTier && <strong className="text-red-800">higher than approved</strong>}
              {r.amendmentId && (
                <Link href={`/applications/${r.amendmentId}`} className="text-ink-800 underline">
                  amendment under way
                </Link>
              )}
            </div>
          </li>
        ))}
      </ul>
    </Card>
  );
}
