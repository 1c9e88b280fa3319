// From a draft (what the form autosaves) to the content a submission freezes. Pure: the form runs it
// to show what is still missing, and submitApplication runs it on the server with the rules in force
// and the attachments from the database, so the browser's figures are never taken on trust.

import { assessSetup, requiredControls, type Assessment, type TierRules } from "@/lib/hazard";
import { formatPath, type FieldIssue } from "@/lib/errors";
import {
  apparatusStepSchema,
  applicationContentSchema,
  applicationDraftSchema,
  attestationStepSchema,
  controlsStepSchema,
  eventStepSchema,
  type ApplicationContent,
  type ApplicationDraft,
  type AttachmentRef,
} from "@/lib/applications/schemas";

/** What the applicant confirms on step 6; stored with each revision as the exact text confirmed. */
export const ATTESTATION_TEXT =
  "I confirm that this application describes the set-up as it will be run, that the figures were " +
  "computed from values I checked against the apparatus, that every control listed will be in place " +
  "whenever the set-up is energised, and that I will stop and ask for a new review if the set-up changes.";

/** Tier 2 and above need a named operator with current training (product rules, default chain). */
export const TRAINED_OPERATOR_FROM_TIER = 2;

export function emptyDraft(): ApplicationDraft {
  return applicationDraftSchema.parse({});
}

/** A new draft from an earlier one: the same event and set-up, new dates, nothing confirmed yet. */
export function duplicateDraft(source: ApplicationDraft): ApplicationDraft {
  const copy = applicationDraftSchema.parse(structuredClone(source));
  copy.event.firstDay = "";
  copy.event.lastDay = "";
  copy.controls.required = copy.controls.required.map((c) => ({ ...c, confirmed: false }));
  copy.attestation.accepted = false;
  return copy;
}

/** Users named on the application (responsible person and operators): they may not decide on it. */
export function namedUserIds(draft: Pick<ApplicationDraft, "event">): string[] {
  const ids = [draft.event.responsible.userId, ...draft.event.operators.map((o) => o.userId)];
  return [...new Set(ids.filter((id): id is string => typeof id === "string"))];
}

function prefixed(prefix: string, issues: readonly { path: PropertyKey[]; message: string }[]): FieldIssue[] {
  return issues.map((issue) => ({ path: formatPath([prefix, ...issue.path]), message: issue.message }));
}

/** The live assessment of a draft's set-up, or null while the set-up does not read yet. */
export function draftAssessment(draft: ApplicationDraft, rules: TierRules): Assessment | null {
  const parsed = apparatusStepSchema.safeParse(draft.apparatus);
  return parsed.success ? assessSetup(parsed.data.setup, rules) : null;
}

export type DraftConversion =
  | { ok: true; content: ApplicationContent; assessment: Assessment; issues: [] }
  | { ok: false; issues: FieldIssue[]; assessment: Assessment | null };

/**
 * Every problem that stands between this draft and a submission, each on its field's path
 * ("event.lastDay", "apparatus.setup.sources[0].capacitance_F", "controls.required[2].confirmed").
 */
export function draftToContent(
  draft: ApplicationDraft,
  context: { rules: TierRules; attachments: readonly AttachmentRef[] },
): DraftConversion {
  const issues: FieldIssue[] = [];
  const event = eventStepSchema.safeParse(draft.event);
  if (!event.success) issues.push(...prefixed("event", event.error.issues));
  const apparatus = apparatusStepSchema.safeParse(draft.apparatus);
  if (!apparatus.success) issues.push(...prefixed("apparatus", apparatus.error.issues));

  const assessment = apparatus.success ? assessSetup(apparatus.data.setup, context.rules) : null;
  let controls: ApplicationContent["controls"] | null = null;
  if (assessment) {
    const parsed = controlsStepSchema(requiredControls(assessment.tier, context.rules)).safeParse(draft.controls);
    if (parsed.success) controls = parsed.data;
    else issues.push(...prefixed("controls", parsed.error.issues));
    if (
      assessment.tier >= TRAINED_OPERATOR_FROM_TIER &&
      !draft.event.operators.some((o) => o.trained && o.name.trim() !== "")
    ) {
      issues.push({
        path: "event.operators",
        message: `Tier ${assessment.tier} needs a named operator with current training: add one on step 1 and tick “trained”.`,
      });
    }
  }
  const attestation = attestationStepSchema.safeParse(draft.attestation);
  if (!attestation.success) issues.push(...prefixed("attestation", attestation.error.issues));

  if (issues.length > 0 || !event.success || !apparatus.success || !assessment || !controls) {
    return { ok: false, issues, assessment };
  }
  const content = applicationContentSchema.safeParse({
    event: event.data,
    apparatus: apparatus.data,
    controls,
    attachments: context.attachments,
    attestation: { accepted: true, text: ATTESTATION_TEXT },
  });
  if (!content.success) return { ok: false, issues: prefixed("", content.error.issues).map(stripRoot), assessment };
  return { ok: true, content: content.data, assessment, issues: [] };
}

function stripRoot(issue: FieldIssue): FieldIssue {
  return { ...issue, path: issue.path.replace(/^\./, "") };
}

/** Issues that belong to one step of the form, by the first segment of their path. */
export function issuesForStep(issues: readonly FieldIssue[], step: number): FieldIssue[] {
  const prefix = { 1: "event", 2: "apparatus", 4: "controls", 5: "attachments", 6: "attestation" }[step];
  return prefix
    ? issues.filter((i) => i.path === prefix || i.path.startsWith(`${prefix}.`) || i.path.startsWith(`${prefix}[`))
    : [];
}
