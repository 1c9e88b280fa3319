import { z } from "zod";
import { ROLE_LABELS, type Role } from "@/lib/roles";

// Chain rules as data: for each tier, who signs and in what order, the longest permit validity and
// the extra requirements the final approver confirms as permit conditions. Pure (no I/O), so the
// admin form, the review policy and the tests share one definition. Stored versioned in rule_set
// (kind "chain"); version 0 is these built-in defaults, used until an admin adopts a version.

export const STEP_ROLES = ["reviewer", "safety_officer"] as const satisfies readonly Role[];
export type StepRole = (typeof STEP_ROLES)[number];

export const STEP_ROLE_LABELS: Record<StepRole, string> = {
  reviewer: ROLE_LABELS.reviewer,
  safety_officer: ROLE_LABELS.safety_officer,
};

export type Requirement = { id: string; text: string };

export type TierChain = {
  /** Signers in order; the last one gives the final approval. Empty: recorded, self-certified. */
  steps: StepRole[];
  /** Longest permit validity, in calendar days (inclusive of the first day). */
  validityDays: number;
  requirements: Requirement[];
};

/**
 * A control the event's audience calls for, whatever the set-up's tier (issue 20: 80 members of the
 * public added nothing beyond the tier's controls). It applies from `minTier` up when the audience
 * includes members of the public (`public`) or numbers at least `minSize` people (null: size alone never
 * triggers it). The final approver confirms it like a tier requirement; it is printed as a condition.
 */
export type AudienceRule = Requirement & { public: boolean; minSize: number | null; minTier: number };

export type ChainRules = {
  tiers: [TierChain, TierChain, TierChain, TierChain, TierChain];
  audience: AudienceRule[];
};

export const BUILT_IN_CHAIN_VERSION = 0;

const TIER_3_REQUIREMENTS: Requirement[] = [
  { id: "second-trained-person", text: "A second trained person is present whenever the set-up is energised." },
  { id: "barrier-at-limited-approach", text: "A barrier stands at the limited approach distance." },
];

// What a safety office expects at a public demonstration (common practice; the 2 m floor and the 50
// people are this product's defaults, for the institution to change). Tier 0 (touch-safe) calls for none.
export const DEFAULT_AUDIENCE_RULES: AudienceRule[] = [
  {
    id: "front-row-distance",
    text: "The front row stays behind a marked line at the limited approach distance, and never nearer than 2 m to the apparatus.",
    public: true,
    minSize: 50,
    minTier: 1,
  },
  {
    id: "audience-steward",
    text: "A steward other than the operator watches the audience whenever the set-up is energised.",
    public: true,
    minSize: 50,
    minTier: 1,
  },
  {
    id: "first-aider-present",
    text: "A trained first aider is present, and the way to the nearest defibrillator is known.",
    public: true,
    minSize: 50,
    minTier: 1,
  },
  {
    id: "audience-briefing",
    text: "The audience is told before the first demonstration where to stay, what they will see and hear, and not to touch the apparatus.",
    public: true,
    minSize: null,
    minTier: 1,
  },
];

// product.md, "Default rules".
export const DEFAULT_CHAIN_RULES: ChainRules = {
  audience: DEFAULT_AUDIENCE_RULES,
  tiers: [
    { steps: [], validityDays: 365, requirements: [] },
    { steps: ["reviewer"], validityDays: 365, requirements: [] },
    {
      steps: ["reviewer", "safety_officer"],
      validityDays: 180,
      requirements: [{ id: "named-operator-trained", text: "The named operator holds current training." }],
    },
    { steps: ["reviewer", "safety_officer"], validityDays: 90, requirements: TIER_3_REQUIREMENTS },
    {
      steps: ["reviewer", "safety_officer"],
      validityDays: 30,
      requirements: [
        ...TIER_3_REQUIREMENTS,
        { id: "interlock-or-remote", text: "The set-up runs in an interlocked enclosure or by remote operation." },
        { id: "officer-pre-use-check", text: "The safety officer has made the pre-use check." },
      ],
    },
  ],
};

/** Longest validity any tier may be given, in days. */
export const MAX_VALIDITY_DAYS = 730;

const requirementSchema = z.object({
  id: z
    .string()
    .trim()
    .regex(/^[a-z0-9][a-z0-9-]{0,59}$/, "Use lower-case letters, digits and hyphens (at most 60)."),
  text: z
    .string()
    .trim()
    .min(3, "Describe the requirement (at least 3 characters).")
    .max(300, "At most 300 characters."),
});

const stepsSchema = z
  .array(z.enum(STEP_ROLES, { error: "Choose reviewer or safety officer." }))
  .max(2, "At most two signers.")
  .refine((steps) => new Set(steps).size === steps.length, "A role may sign only once in a chain.")
  .refine(
    (steps) => !(steps[0] === "safety_officer" && steps[1] === "reviewer"),
    "The reviewer signs before the safety officer.",
  );

const tierChainSchema = z.object({
  steps: stepsSchema,
  validityDays: z
    .number({ error: "Enter a number of days." })
    .int("Enter a whole number of days.")
    .min(1, "At least 1 day.")
    .max(MAX_VALIDITY_DAYS, `At most ${MAX_VALIDITY_DAYS} days.`),
  requirements: z
    .array(requirementSchema)
    .max(12, "At most 12 requirements.")
    .refine((list) => new Set(list.map((r) => r.id)).size === list.length, "Each requirement needs its own id."),
});

const audienceRuleSchema = requirementSchema.extend({
  public: z.boolean(),
  minSize: z
    .number({ error: "Enter a number of people." })
    .int("Enter a whole number of people.")
    .min(1, "At least 1 person.")
    .max(100_000, "At most 100 000 people.")
    .nullable(),
  minTier: z.number().int().min(0, "Tier 0 to 4.").max(4, "Tier 0 to 4."),
});

const audienceRulesSchema = z
  .array(audienceRuleSchema)
  .max(12, "At most 12 audience controls.")
  .refine((list) => new Set(list.map((r) => r.id)).size === list.length, "Each audience control needs its own id.")
  .refine((list) => list.every((r) => r.public || r.minSize !== null), {
    message: "Each audience control applies to the public, from a number of people, or both.",
  });

/**
 * A chain rule set an admin may adopt. A higher tier may never have a shorter chain or a longer
 * validity than a lower one, and tiers 2–4 always end with the safety officer: a stored rule set can
 * make the rules stricter, never let a lethal set-up through on fewer signatures.
 */
export const chainRulesSchema = z
  .object({
    tiers: z.tuple([tierChainSchema, tierChainSchema, tierChainSchema, tierChainSchema, tierChainSchema]),
    // Rule sets adopted before audience controls existed take the defaults: stricter, never looser.
    audience: audienceRulesSchema.default(DEFAULT_AUDIENCE_RULES),
  })
  .superRefine((rules, ctx) => {
    rules.tiers.forEach((chain, tier) => {
      if (tier >= 2 && chain.steps.at(-1) !== "safety_officer") {
        ctx.addIssue({
          code: "custom",
          path: ["tiers", tier, "steps"],
          message: "Tiers 2 to 4 end with the safety officer's approval.",
        });
      }
      if (tier === 0) return;
      const lower = rules.tiers[tier - 1];
      if (chain.steps.length < lower.steps.length) {
        ctx.addIssue({
          code: "custom",
          path: ["tiers", tier, "steps"],
          message: `Needs at least as many signers as tier ${tier - 1}.`,
        });
      }
      if (chain.validityDays > lower.validityDays) {
        ctx.addIssue({
          code: "custom",
          path: ["tiers", tier, "validityDays"],
          message: `May not be longer than tier ${tier - 1} (${lower.validityDays} days).`,
        });
      }
    });
  });

export function tierChain(rules: ChainRules, tier: number): TierChain {
  const chain = rules.tiers[tier];
  if (!chain) throw new Error(`no chain rules for tier ${tier}`);
  return chain;
}

/** The event facts audience controls look at (from a revision's content; missing facts count as none). */
export type AudienceFacts = { audience: string | null; audienceSize: number | null };

export function audienceFactsOf(content: unknown): AudienceFacts {
  const event = (content as { event?: { audience?: unknown; audienceSize?: unknown } } | null)?.event;
  return {
    audience: typeof event?.audience === "string" ? event.audience : null,
    audienceSize: typeof event?.audienceSize === "number" ? event.audienceSize : null,
  };
}

/** The audience controls that apply to an event at a tier, in the rule set's order. */
export function audienceRequirements(rules: ChainRules, tier: number, facts: AudienceFacts): Requirement[] {
  return (rules.audience ?? [])
    .filter((r) => tier >= r.minTier)
    .filter(
      (r) =>
        (r.public && facts.audience === "public") ||
        (r.minSize !== null && facts.audienceSize !== null && facts.audienceSize >= r.minSize),
    )
    .map(({ id, text }) => ({ id, text }));
}

/**
 * Everything the final approver confirms, printed on the permit as conditions: the tier's
 * requirements, then the audience's (an id both name is listed once).
 */
export function approvalRequirements(rules: ChainRules, tier: number, facts: AudienceFacts): Requirement[] {
  const own = tierChain(rules, tier).requirements;
  const ids = new Set(own.map((r) => r.id));
  return [...own, ...audienceRequirements(rules, tier, facts).filter((r) => !ids.has(r.id))];
}

/** "Reviewer, then safety officer" / "None: recorded, self-certified". */
export function describeChain(chain: TierChain): string {
  if (chain.steps.length === 0) return "None: recorded, self-certified";
  return chain.steps.map((s, i) => (i === 0 ? STEP_ROLE_LABELS[s] : STEP_ROLE_LABELS[s].toLowerCase())).join(", then ");
}

// Reminders: e-mails to the permit holder this many days before the permit expires, at the end of its
// last valid day (1 = on the last valid day, 0 = the day after, when it has expired).
export type ReminderRules = { daysBefore: number[] };

export const DEFAULT_REMINDER_RULES: ReminderRules = { daysBefore: [30, 7, 1, 0] };

export const reminderRulesSchema = z.object({
  daysBefore: z
    .array(
      z
        .number({ error: "Enter a number of days." })
        .int("Enter whole days.")
        .min(0, "0 or more.")
        .max(365, "At most 365."),
    )
    .min(1, "Keep at least one reminder.")
    .max(10, "At most 10 reminders.")
    .refine((days) => new Set(days).size === days.length, "Each day may appear once.")
    .transform((days) => [...days].sort((a, b) => b - a)),
});

export const RULE_KINDS = ["chain", "tier", "reminders"] as const;
export type RuleKind = (typeof RULE_KINDS)[number];
