"use client";

import { Alert } from "@/app/_components/alert";
import { ButtonLink } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { TierBadge } from "@/app/_components/tier-badge";
import type { Tier } from "@/lib/hazard";
import { ReturnComments, type ReturnComment } from "./return-comments";

export type Submitted = { id: string; state: string; revision: number; tier: Tier; contentHash: string };

/** What the form shows once submitted (loaded with the later steps: only step 6 submits). */
export function SubmittedCard({
  submitted,
  applicationId,
  returnComments,
}: {
  submitted: Submitted;
  applicationId: string | null;
  returnComments?: ReturnComment[];
}) {
  return (
    <Card>
      <div className="flex flex-col gap-4" data-testid="submitted">
        <Alert tone="success" title="Submitted for review" live>
          Revision {submitted.revision} was submitted
          {submitted.state === "approved"
            ? " and self-certified (its tier needs no review)."
            : "; the reviewers of your department have been told."}
        </Alert>
        <p className="flex items-center gap-2 text-sm text-stone-800">
          Tier as computed on the server: <TierBadge tier={submitted.tier} />
        </p>
        <div className="flex flex-wrap gap-2">
          <ButtonLink href={`/applications/${submitted.id}`}>Open the application</ButtonLink>
          <ButtonLink href="/applications" variant="secondary">
            All my applications
          </ButtonLink>
        </div>
        {returnComments && applicationId && (
          <ReturnComments applicationId={applicationId} comments={returnComments} onGoTo={() => {}} history />
        )}
      </div>
    </Card>
  );
}
