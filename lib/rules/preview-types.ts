// What POST /api/admin/rules/preview answers (lib/rules/preview.ts computes it; the admin form shows it).

export type TierMove = {
  id: string;
  /** "A-123" for an application, the permit number for a permit. */
  reference: string;
  /** Null when the viewer may not read the record's title (they see its reference and tiers only). */
  title: string | null;
  departmentName: string;
  recordedTier: number;
  tierNow: number;
  tierNew: number;
};

export type RulesPreview = {
  rulesVersionNow: string;
  rulesVersionNew: string;
  applications: TierMove[];
  permits: TierMove[];
  /** How many records were assessed, and how many stored set-ups the engine refused (not listed). */
  checked: { applications: number; permits: number; unreadable: number };
};
