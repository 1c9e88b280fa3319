import Link from "next/link";
import { can, type CurrentUser } from "@/lib/auth/guards";
import { CHECK_DUE_DAYS, permitsDueACheck } from "@/lib/checks/queries";
import { Card } from "../card";
import { formatDate, formatDateTime } from "../format";
import { isTier } from "../tier";
import { TierBadge } from "../tier-badge";
import { institutionTimeZone } from "@/lib/settings/queries";

// For safety officers: tier 3–4 permits in use with no pre-use check in the last 7 days. Reads its own
// data (nothing for anyone else), so the dashboard adds it in one line.

export async function ChecksDueSection({ user }: { user: CurrentUser }) {
  // Only officers are asked to follow these up.
  if (!can(user, "permit.check.any")) return null;
  const [rows, timeZone] = await Promise.all([permitsDueACheck(user), institutionTimeZone()]);
  return (
    <Card
      title="No pre-use check lately"
      description={`Tier 3–4 permits in use with no check in the last ${CHECK_DUE_DAYS} days.`}
      flush
    >
      {rows.length === 0 ? (
        <p className="px-4 py-6 text-sm text-stone-600">Every tier 3–4 permit in use has a recent check.</p>
      ) : (
        <ul className="divide-y divide-stone-100" data-testid="checks-due">
          {rows.map((p) => (
            <li key={p.id} className="flex flex-col gap-1 px-4 py-3">
              <div className="flex items-baseline justify-between gap-3">
                <Link
                  href={`/permits/${p.id}`}
                  className="figure text-sm font-medium text-ink-800 underline decoration-ink-300"
                >
                  {p.number}
                </Link>
                <span className="text-sm text-stone-700">
                  {p.lastCheckedAt ? `last ${formatDateTime(p.lastCheckedAt, timeZone)}` : "never checked"}
                </span>
              </div>
              <p className="text-sm text-stone-800">
                {p.title} <span className="text-stone-600">· ends {formatDate(p.validTo)}</span>
              </p>
              {isTier(p.tier) && <TierBadge tier={p.tier} size="sm" className="self-start" />}
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
