import "server-only";
import { asc, eq } from "drizzle-orm";
import { db } from "@/db";
import { trainingExceptions, type TrainingException } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { getDraftForEdit } from "@/lib/applications/queries";
import type { CurrentUser } from "@/lib/auth/guards";
import { conflict } from "@/lib/errors";
import { defaultValidity, eventDaysOf, todayIn } from "@/lib/permits/dates";
import { currentChainRules } from "@/lib/rules/queries";
import { tierChain } from "@/lib/rules/chain";
import { institutionTimeZone } from "@/lib/settings/queries";
import { operatorsOf, operatorTraining } from "@/lib/training/queries";
import {
  describeGap,
  trainingGaps,
  uncoveredGaps,
  type OperatorTraining,
  type TrainingGap,
} from "@/lib/training/status";

// The training gate of the final approval (issue 17): every named operator holds each course the
// tier requires (in the application's department), current through the permit's last day, or the
// approver has recorded a signed exception for that person and course on this revision
// (lib/review/training-exception.ts). Nobody may record an exception on their own application: the
// same policy as the decision itself.

export type TrainingCheck = {
  throughDay: string;
  operators: OperatorTraining[];
  gaps: TrainingGap[];
  /** Gaps no exception on this revision covers: the approval waits for these. */
  open: TrainingGap[];
  exceptions: Pick<
    TrainingException,
    "id" | "reason" | "signerName" | "signerRole" | "signedAt" | "gaps" | "throughDay"
  >[];
};

export async function exceptionsFor(revisionId: string, tx: DbOrTx = db) {
  return tx
    .select({
      id: trainingExceptions.id,
      reason: trainingExceptions.reason,
      signerName: trainingExceptions.signerName,
      signerRole: trainingExceptions.signerRole,
      signedAt: trainingExceptions.signedAt,
      gaps: trainingExceptions.gaps,
      throughDay: trainingExceptions.throughDay,
    })
    .from(trainingExceptions)
    .where(eq(trainingExceptions.revisionId, revisionId))
    .orderBy(asc(trainingExceptions.signedAt));
}

export async function trainingCheck(
  application: { departmentId: string },
  revision: { id: string; tier: number; content: unknown },
  throughDay: string,
  tx: DbOrTx = db,
): Promise<TrainingCheck> {
  const operators = await operatorTraining(
    {
      tier: revision.tier,
      departmentId: application.departmentId,
      operators: operatorsOf(revision.content),
      throughDay,
    },
    tx,
  );
  const gaps = trainingGaps(operators);
  const exceptions = gaps.length > 0 ? await exceptionsFor(revision.id, tx) : [];
  const open = uncoveredGaps(
    gaps,
    exceptions.flatMap((e) => e.gaps),
  );
  return { throughDay, operators, gaps, open, exceptions };
}

/** The refusal's words: who lacks which course, and the two ways on. */
export function trainingRefusalMessage(open: readonly TrainingGap[], throughDay: string): string {
  const byPerson = new Map<string, string[]>();
  for (const g of open) byPerson.set(g.operator, [...(byPerson.get(g.operator) ?? []), describeGap(g)]);
  const list = [...byPerson].map(([person, items]) => `${person} (${items.join("; ")})`).join(", ");
  return (
    `Named operators' training is not current through ${throughDay}, the permit's last day: ${list}. ` +
    "Record the training, or record a training exception with its reason before approving."
  );
}

/** Refuses the final approval (409) while a named operator's required course is lapsed or missing. */
export async function assertOperatorsTrained(
  application: { departmentId: string },
  revision: { id: string; tier: number; content: unknown },
  throughDay: string,
  tx: DbOrTx = db,
): Promise<void> {
  const check = await trainingCheck(application, revision, throughDay, tx);
  if (check.open.length > 0) throw conflict(trainingRefusalMessage(check.open, throughDay));
}

export type SubmissionTrainingCheck = {
  /** The draft's tier as last saved (null while the set-up does not assess). */
  tier: number | null;
  /** The permit's proposed last day: the event's last day, cut to the tier's longest validity. */
  throughDay: string | null;
  operators: OperatorTraining[];
};

/**
 * The same check at submission (issue 17), for the applicant's own draft as last saved: its tier,
 * its named operators and the permit's proposed last day (defaultValidity, as the approver's panel
 * proposes it), in the application's department. Shown beside each operator on the form's last step;
 * it decides nothing — the final approval does (assertOperatorsTrained).
 */
export async function submissionTrainingCheck(
  user: CurrentUser,
  applicationId: string,
): Promise<SubmissionTrainingCheck> {
  const draft = await getDraftForEdit(user, applicationId);
  if (draft.tier === null || draft.tier < 0 || draft.tier > 4) return { tier: null, throughDay: null, operators: [] };
  const [{ rules }, timeZone] = await Promise.all([currentChainRules(), institutionTimeZone()]);
  const chain = tierChain(rules, draft.tier);
  const throughDay = defaultValidity(eventDaysOf(draft.draft), chain.validityDays, todayIn(timeZone)).validTo;
  const operators = await operatorTraining({
    tier: draft.tier,
    departmentId: draft.departmentId,
    operators: operatorsOf(draft.draft).filter((o) => o.userId || o.name.trim()),
    throughDay,
  });
  return { tier: draft.tier, throughDay, operators };
}
