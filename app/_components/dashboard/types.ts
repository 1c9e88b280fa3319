import type { ApplicationState } from "../state-badge";
import type { Tier } from "../tier";

// What the dashboard sections need, nothing more: the queries map rows onto these.

export type DraftSummary = {
  id: string;
  title: string;
  apparatusName?: string | null;
  /** Tier of the draft's latest assessment, if it has one yet. */
  tier?: Tier | null;
  updatedAt: Date | string;
};

export type OpenApplicationSummary = {
  id: string;
  title: string;
  state: Extract<ApplicationState, "submitted" | "in_review" | "returned">;
  tier: Tier | null;
  submittedAt: Date | string | null;
};

export type ExpiringPermitSummary = {
  id: string;
  /** PREFIX-YYYY-NNNN (prefix from the institution settings, default HV) */
  number: string;
  title: string;
  room?: string | null;
  tier: Tier;
  validUntil: Date | string;
};

export type TierCounts = Partial<Record<Tier, number>>;
