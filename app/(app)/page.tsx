import type { Metadata } from "next";
import Link from "next/link";
import { ButtonLink } from "@/app/_components/button";
import { ChecksDueSection } from "@/app/_components/dashboard/checks-due-section";
import { Card } from "@/app/_components/card";
import {
  DraftsSection,
  ExpiringPermitsSection,
  OpenApplicationsSection,
  ReviewQueueSection,
} from "@/app/_components/dashboard";
import { formatDateTime } from "@/app/_components/format";
import { PageHeader } from "@/app/_components/page-header";
import type { Tier } from "@/app/_components/tier";
import { TierBadge } from "@/app/_components/tier-badge";
import { ApparatusChangesSection } from "@/app/_components/rereview/apparatus-changes-section";
import { TrainingLapsesSection } from "@/app/_components/training/training-lapses-section";
import { myDashboardApplications } from "@/lib/applications/queries";
import { redirect } from "next/navigation";
import { can, getCurrentUser, requirePageUser } from "@/lib/auth/guards";
import { expiringPermits } from "@/lib/permits/queries";
import { institutionTimeZone } from "@/lib/settings/queries";
import { listQueue, queueCountsByTier } from "@/lib/review/queries";
import { adminOverview } from "@/lib/users/queries";

export const metadata: Metadata = { title: "Dashboard" };

// One page, sections by permission: applicants see their drafts and open applications, reviewers and
// officers their queue by tier and the oldest wait, everyone with permits those ending soon, admins
// their users and rules.
export default async function DashboardPage() {
  // A responder's account lands on the one page it may see (sign-in sends everyone to "/").
  const signedIn = await getCurrentUser();
  if (signedIn && !can(signedIn, "workspace.use") && can(signedIn, "live.read")) redirect("/live");
  const user = await requirePageUser(undefined, "/");
  const applies = can(user, "application.create");
  const reviews = can(user, "application.review");
  const administers = can(user, "admin.users");

  const [mine, expiring, counts, oldest, overview, timeZone] = await Promise.all([
    applies ? myDashboardApplications(user) : null,
    expiringPermits(user, 30),
    reviews ? queueCountsByTier(user) : null,
    // Only the oldest: no count, one row.
    reviews ? listQueue(user, { scope: "mine" }, new Date(), { pageSize: 1, count: false }) : null,
    administers ? adminOverview(user) : null,
    institutionTimeZone(),
  ]);
  const firstWaiting = oldest?.rows[0];

  return (
    <>
      <PageHeader
        title="Dashboard"
        description={`Signed in as ${user.name}.`}
        actions={
          applies ? (
            <>
              <ButtonLink href="/apparatus/new" variant="secondary">
                Register apparatus
              </ButtonLink>
              <ButtonLink href="/applications/new">New application</ButtonLink>
            </>
          ) : undefined
        }
      />

      <div className="grid gap-6 lg:grid-cols-3">
        <div className="flex min-w-0 flex-col gap-6 lg:col-span-2">
          {reviews && firstWaiting && (
            <Card title="Waiting longest for you">
              <p className="text-sm text-stone-700">
                <Link href={`/applications/${firstWaiting.id}`} className="font-medium">
                  A-{firstWaiting.seq} · {firstWaiting.title || "Untitled application"}
                </Link>{" "}
                from {firstWaiting.applicantName} ({firstWaiting.departmentName}), waiting since{" "}
                {firstWaiting.waitingSince ? formatDateTime(firstWaiting.waitingSince, timeZone) : "—"}.
              </p>
              {firstWaiting.tier !== null && <TierBadge tier={firstWaiting.tier as Tier} className="mt-2" />}
            </Card>
          )}
          {applies && <ApparatusChangesSection user={user} />}
          <TrainingLapsesSection user={user} />
          {mine && <DraftsSection drafts={mine.drafts} />}
          {mine && <OpenApplicationsSection applications={mine.open} />}
          {overview && (
            <Card
              title="Administration"
              actions={
                <Link href="/admin/users" className="text-sm font-medium text-ink-700 hover:text-ink-900">
                  Users
                </Link>
              }
            >
              <dl className="grid grid-cols-2 gap-4 text-sm sm:grid-cols-4">
                <div>
                  <dt className="text-stone-600">Active users</dt>
                  <dd className="figure text-lg text-stone-900">{overview.activeUsers}</dd>
                </div>
                <div>
                  <dt className="text-stone-600">Disabled</dt>
                  <dd className="figure text-lg text-stone-900">{overview.disabledUsers}</dd>
                </div>
                <div>
                  <dt className="text-stone-600">Open invitations</dt>
                  <dd className="figure text-lg text-stone-900">{overview.openInvitations}</dd>
                </div>
                <div>
                  <dt className="text-stone-600">Rules</dt>
                  <dd className="text-stone-900">
                    <Link href="/admin/rules">Chain, tiers, reminders</Link>
                  </dd>
                </div>
              </dl>
            </Card>
          )}
        </div>
        <div className="flex min-w-0 flex-col gap-6">
          {counts && <ReviewQueueSection counts={counts} />}
          <ChecksDueSection user={user} />
          <ExpiringPermitsSection permits={expiring.map((p) => ({ ...p, tier: p.tier as Tier }))} />
        </div>
      </div>
    </>
  );
}
