"use client";

import { Alert } from "@/app/_components/alert";
import { AboutFigures } from "@/app/_components/about-figures";
import { TierResult } from "@/app/_components/hazard/tier-result";
import { WayDownList } from "@/app/_components/hazard/way-down-list";
import type { LiveAssessment } from "@/app/_components/hazard/use-live-assessment";
import type { TierRules } from "@/lib/hazard";

export function ResultStep({ live, rules }: { live: LiveAssessment; rules: TierRules }) {
  if (!live.assessment) {
    return (
      <div className="flex flex-col gap-4">
        <Alert tone="warn" title="No result yet">
          The set-up on step 2 is not complete: {live.issues.length} field{live.issues.length === 1 ? "" : "s"} to
          complete or correct.
        </Alert>
        <AboutFigures />
      </div>
    );
  }
  return (
    <div className="flex flex-col gap-4">
      <TierResult assessment={live.assessment} setup={live.setup} rules={rules} headingLevel={3} />
      <WayDownList assessment={live.assessment} setup={live.setup} rules={rules} />
    </div>
  );
}
