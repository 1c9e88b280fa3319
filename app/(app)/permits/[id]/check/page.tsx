import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { Alert } from "@/app/_components/alert";
import { formatDate } from "@/app/_components/format";
import { StateBadge } from "@/app/_components/state-badge";
import { isTier } from "@/app/_components/tier";
import { TierBadge } from "@/app/_components/tier-badge";
import { requirePageUser } from "@/lib/auth/guards";
import { checkTarget, mayRecordCheck } from "@/lib/checks/queries";
import { PreUseCheckForm } from "./_components/pre-use-check-form";

// The page behind the bench card's second QR code: the permit's pre-use checklist on a phone. Signing
// in returns here (the address is kept through the sign-in page). The public status page stays the
// other QR code's business.

export const metadata: Metadata = { title: "Pre-use check" };

export default async function PreUseCheckPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser(undefined, `/permits/${id}/check`);
  if (!z.uuid().safeParse(id).success) notFound();
  const target = await checkTarget(user, id);
  if (!target) notFound();
  const { permit } = target;
  const allowed = mayRecordCheck(user, target);

  return (
    <div className="mx-auto flex max-w-xl flex-col gap-4">
      <header>
        <p className="text-sm text-stone-600">
          <Link href={`/permits/${permit.id}`} className="figure underline decoration-stone-300">
            {permit.number}
          </Link>{" "}
          · Pre-use check
        </p>
        <h1 className="mt-1 text-xl font-semibold tracking-tight text-stone-900">
          {permit.apparatusName || permit.title}
        </h1>
        <p className="mt-0.5 text-sm text-stone-700">
          {permit.room ? `Room ${permit.room} · ` : ""}Holder {permit.holderName}
        </p>
        <div className="mt-2 flex flex-wrap items-center gap-2">
          <StateBadge kind="permit" state={target.effectiveState} />
          {isTier(permit.tier) && <TierBadge tier={permit.tier} size="sm" />}
        </div>
      </header>

      {!allowed ? (
        <Alert tone="info" title="You cannot record a check on this permit">
          The permit&rsquo;s holder, the people named on it and safety officers record its pre-use checks.
        </Alert>
      ) : target.effectiveState !== "active" ? (
        <Alert tone="error" title={`This permit is ${target.effectiveState}`}>
          Do not run the set-up under it. A check is recorded only on an active permit.
        </Alert>
      ) : !target.inUse ? (
        <Alert tone="warn" title="Not valid yet">
          This permit is valid from {formatDate(permit.validFrom)}; record the check on that day.
        </Alert>
      ) : (
        <PreUseCheckForm permitId={permit.id} userId={user.id} checklist={target.checklist} />
      )}
    </div>
  );
}
