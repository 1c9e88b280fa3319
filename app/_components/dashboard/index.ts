export { DraftsSection } from "./drafts-section";
export { ExpiringPermitsSection } from "./expiring-permits-section";
export { OpenApplicationsSection } from "./open-applications-section";
export { ReviewQueueSection } from "./review-queue-section";
export type { DraftSummary, ExpiringPermitSummary, OpenApplicationSummary, TierCounts } from "./types";
