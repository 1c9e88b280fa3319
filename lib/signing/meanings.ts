import type { DecisionKind } from "@/db/schema";

// What each signature means, stored with the decision and printed wherever it is shown.
export const DECISION_MEANINGS: Record<DecisionKind, string> = {
  recommend: "Recommended: the reviewer has checked this revision and recommends it for approval.",
  return: "Returned: this revision needs changes before it can be decided.",
  approve: "Approved: the set-up may be operated under this permit, within its validity and conditions.",
  reject: "Rejected: the set-up may not be operated under this application.",
  revoke: "Revoked: the permit no longer allows the set-up to be operated.",
};

export const DECISION_LABELS: Record<DecisionKind, string> = {
  recommend: "Recommended",
  return: "Returned",
  approve: "Approved",
  reject: "Rejected",
  revoke: "Revoked",
};
