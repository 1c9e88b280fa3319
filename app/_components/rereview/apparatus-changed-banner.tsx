import Link from "next/link";
import { cx } from "@/app/_components/cx";
import { formatDateTime } from "@/app/_components/format";
import { isTier } from "@/app/_components/tier";
import { TierBadge } from "@/app/_components/tier-badge";
import type { CurrentUser } from "@/lib/auth/guards";
import { apparatusChangeForPermit } from "@/lib/rereview/queries";
import { institutionTimeZone } from "@/lib/settings/queries";
import { AmendButton } from "./amend-button";

const AMENDMENT_STATE: Record<string, string> = {
  draft: "a draft",
  submitted: "submitted",
  in_review: "in review",
  returned: "returned for changes",
  approved: "approved",
  rejected: "not approved",
  withdrawn: "withdrawn",
};

/**
 * "Apparatus changed since approval" on a permit: the apparatus was saved as a new revision while the
 * permit covered it. Field by field, old → new with units, the new tier (marked when higher than the
 * permit's), and the holder's way to an amendment. Renders nothing when the apparatus has not changed.
 */
export async function ApparatusChangedBanner({ user, permitId }: { user: CurrentUser; permitId: string }) {
  const [change, timeZone] = await Promise.all([apparatusChangeForPermit(user, permitId), institutionTimeZone()]);
  if (!change) return null;
  const newest = change.revisions[change.revisions.length - 1];
  const higher = change.tier > change.permitTier;
  const from = change.approvedRevision ? `revision ${change.approvedRevision}` : "the approved set-up";
  return (
    <section
      aria-labelledby="apparatus-changed-heading"
      data-testid="apparatus-changed"
      className={cx(
        "mb-6 rounded-lg border-2 bg-amber-50 px-4 py-3 text-sm text-stone-900",
        higher ? "border-red-700" : "border-amber-400",
      )}
    >
      <h2 id="apparatus-changed-heading" className="text-base font-semibold text-stone-900">
        Apparatus changed since approval
      </h2>
      <p className="mt-1">
        {change.apparatusName} was saved as revision {newest.revision} by {newest.changedByName} on{" "}
        {formatDateTime(newest.changedAt, timeZone)}
        {change.revisions.length > 1 ? ` (${change.revisions.length} revisions since approval)` : ""}; this permit
        covers {from}. The permit stays as approved unless a safety officer revokes it: run the set-up only as the
        permit describes it.
      </p>
      <div className="mt-2 flex flex-wrap items-center gap-2" data-testid="apparatus-changed-tier">
        <span>Approved at</span>
        {isTier(change.permitTier) && <TierBadge tier={change.permitTier} size="sm" />}
        <span>now assessed at</span>
        {isTier(change.tier) && (
          <TierBadge
            tier={change.tier}
            size="sm"
            className={higher ? "ring-2 ring-red-700 ring-offset-1" : undefined}
          />
        )}
        {higher && <strong className="text-red-800">Higher than the permit&rsquo;s tier {change.permitTier}.</strong>}
        <span className="text-xs text-stone-600">
          (engine {change.engineVersion}, tier rules {change.rulesVersion})
        </span>
      </div>
      {change.changes.length === 0 ? (
        <p className="mt-2 text-stone-700">
          The newest revision shows the same fields and figures as the approved one.
        </p>
      ) : (
        <div
          className="mt-3 overflow-x-auto rounded-md border border-amber-200 bg-white"
          tabIndex={0}
          role="group"
          aria-label="What changed since approval"
        >
          <table className="w-full text-left text-sm">
            <caption className="sr-only">What changed since approval</caption>
            <thead className="border-b border-stone-200 bg-stone-50 text-xs tracking-wide text-stone-600 uppercase">
              <tr>
                <th scope="col" className="px-3 py-1.5 font-medium">
                  Field
                </th>
                <th scope="col" className="px-3 py-1.5 font-medium">
                  Approved
                </th>
                <th scope="col" className="px-3 py-1.5 font-medium">
                  Now
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-stone-100">
              {change.changes.map((e) => (
                <tr key={e.path} className="align-top">
                  <th scope="row" className="px-3 py-1.5 font-normal">
                    <span className="block text-xs text-stone-600">{e.section}</span>
                    <span className="text-stone-900">{e.label}</span>
                  </th>
                  <td className="px-3 py-1.5 text-stone-700">
                    <del className="decoration-red-700/60">{e.before}</del>
                  </td>
                  <td className="px-3 py-1.5 text-stone-900">
                    <span aria-hidden="true">→ </span>
                    <ins className="bg-emerald-50 no-underline">{e.after}</ins>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <div className="mt-3 flex flex-col gap-2">
        {change.amendment && (
          <p>
            Amendment{" "}
            <Link href={`/applications/${change.amendment.id}`} className="font-medium underline">
              A-{change.amendment.seq}
            </Link>{" "}
            is {AMENDMENT_STATE[change.amendment.state] ?? change.amendment.state}.
          </p>
        )}
        {change.mayAmend && (
          <>
            <p className="text-stone-700">
              To run it as it is now, start an amendment: a new application from this permit with the changed apparatus,
              reviewed as usual.
            </p>
            <AmendButton permitId={change.permitId} />
          </>
        )}
      </div>
    </section>
  );
}
