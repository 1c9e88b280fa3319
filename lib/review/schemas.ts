import { z } from "zod";
import { expectedVersion, signingPassword as password } from "@/lib/signing/schemas";

// Request bodies of the review endpoints, shared by the decision panel and the server.
// The signer, their role, the step, the state and the content hash are never taken from the client:
// the server derives them. `expectedVersion` is the optimistic-concurrency token the page was rendered
// with; a stale one answers 409.

const comment = z.string().trim().max(4000, "Use at most 4000 characters.");
const requiredComment = (what: string) => comment.min(1, `Write ${what}.`);
const isoDay = z.iso.date({ error: "Enter a date (YYYY-MM-DD)." });

/** A return comment may point at a form step ("step:2") or a field path ("event.firstDay", "apparatus.setup.sources[0]"). */
export const pinSchema = z
  .string()
  .trim()
  .max(160, "Use at most 160 characters.")
  .regex(
    /^(step:[1-6]|[A-Za-z][A-Za-z0-9_]*(\.[A-Za-z][A-Za-z0-9_]*|\[\d{1,3}\])*)$/,
    'Pin to "step:1"…"step:6" or a field path such as "event.firstDay".',
  );

export const decisionBodySchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("recommend"), expectedVersion, comment: comment.optional() }),
  z.object({
    kind: z.literal("return"),
    expectedVersion,
    comment: requiredComment("what needs to change"),
    pinnedTo: z.union([pinSchema, z.literal("")]).optional(),
  }),
  z.object({
    kind: z.literal("approve"),
    expectedVersion,
    password,
    comment: comment.optional(),
    /** Ids of the tier's requirements the approver confirms (each one is required). */
    confirmedRequirements: z.array(z.string().max(60)).max(20).default([]),
    /** Conditions of the approver's own, printed on the permit. */
    extraConditions: z
      .array(z.string().trim().min(1, "Remove the empty condition.").max(300, "At most 300 characters."))
      .max(10, "At most 10 conditions.")
      .default([]),
    validFrom: isoDay.optional(),
    validTo: isoDay.optional(),
    /** Required when the window reaches beyond the event days; printed on the permit. */
    validityReason: z.string().trim().max(500, "Use at most 500 characters.").optional(),
  }),
  z.object({
    kind: z.literal("reject"),
    expectedVersion,
    password,
    comment: requiredComment("the reason for the rejection"),
  }),
]);

export type DecisionBody = z.infer<typeof decisionBodySchema>;

const blankToUndefined = (v: unknown) => (v === "" || v === null ? undefined : v);

/** The review queue's filters, from the URL (page) or the query string (API). */
export const queueQuerySchema = z.object({
  tier: z.preprocess(
    blankToUndefined,
    z.coerce.number().int().min(0, "Tier 0 to 4.").max(4, "Tier 0 to 4.").optional(),
  ),
  department: z.preprocess(blankToUndefined, z.uuid({ error: "Choose a department from the list." }).optional()),
  state: z.preprocess(
    blankToUndefined,
    z.enum(["submitted", "in_review"], { error: "Submitted or in review." }).optional(),
  ),
  /** Waiting at least this many days. */
  age: z.preprocess(blankToUndefined, z.coerce.number().int().min(0).max(3650).optional()),
  scope: z.preprocess(blankToUndefined, z.enum(["mine", "all"]).default("mine")),
  page: z.preprocess(blankToUndefined, z.coerce.number().int().min(1).max(100_000).default(1)),
});

export type QueueQuery = z.infer<typeof queueQuerySchema>;

const instant = z.union([z.iso.date(), z.iso.datetime({ offset: true })], {
  error: "Use a date (YYYY-MM-DD) or an ISO date-time.",
});

/** The audit export's range: dates are whole UTC days, both ends included. */
export const auditRangeSchema = z
  .object({
    from: z.preprocess(blankToUndefined, instant.optional()),
    to: z.preprocess(blankToUndefined, instant.optional()),
  })
  .transform((q) => ({
    from: q.from ? new Date(q.from.length === 10 ? `${q.from}T00:00:00.000Z` : q.from) : undefined,
    to: q.to ? new Date(q.to.length === 10 ? `${q.to}T23:59:59.999Z` : q.to) : undefined,
  }))
  .refine((r) => !r.from || !r.to || r.from <= r.to, { path: ["to"], message: "The end is before the start." });
