import type { Metadata } from "next";
import { ButtonLink } from "@/app/_components/button";
import {
  DraftsSection,
  ExpiringPermitsSection,
  OpenApplicationsSection,
  ReviewQueueSection,
} from "@/app/_components/dashboard";
import { PageHeader } from "@/app/_components/page-header";

export const metadata: Metadata = { title: "Dashboard" };

// Sections take their rows as props; the queries (and which sections a role sees) are wired here.
export default function DashboardPage() {
  return (
    <>
      <PageHeader
        title="Dashboard"
        description="Your drafts and open applications, permits that end soon, and what waits for review."
        actions={
          <>
            <ButtonLink href="/apparatus/new" variant="secondary">
              Register apparatus
            </ButtonLink>
            <ButtonLink href="/applications/new">New application</ButtonLink>
          </>
        }
      />

      <div className="grid gap-6 lg:grid-cols-3">
        <div className="flex min-w-0 flex-col gap-6 lg:col-span-2">
          <DraftsSection drafts={[]} />
          <OpenApplicationsSection applications={[]} />
        </div>
        <div className="flex min-w-0 flex-col gap-6">
          <ExpiringPermitsSection permits={[]} />
          <ReviewQueueSection counts={{ 0: 0, 1: 0, 2: 0, 3: 0, 4: 0 }} />
        </div>
      </div>
    </>
  );
}
