// Who may take which decision on an application, as a pure function of the application, the chain
// rules it was submitted under, the actor and who already signed its current revision. The decision
// actions call it before and inside their transaction; the read page calls it to show the panel.
//
// Refusals carry their HTTP meaning: 403 for "not you" (role, department, separation of duties), 409
// for "not now" (the application is not waiting for this decision any more, e.g. a lost race).

import type { ApplicationState, DecisionKind } from "@/db/schema";
import { rolesHave } from "@/lib/auth/permissions";
import { separationOfDuties, type PolicyActor, type Refusal } from "@/lib/signing/duties";
import { STEP_ROLE_LABELS, tierChain, type ChainRules, type StepRole } from "@/lib/rules/chain";

export type ChainDecisionKind = Exclude<DecisionKind, "revoke">;

export type PolicyApplication = {
  state: ApplicationState;
  tier: number | null;
  chainStep: number;
  departmentId: string;
  applicantId: string;
  namedUserIds: readonly string[];
};

export type PolicyInput = {
  actor: PolicyActor;
  application: PolicyApplication;
  rules: ChainRules;
  /** Who submitted the current revision (normally the applicant). */
  submittedById: string | null;
  /** Signers of decisions already recorded on the current revision. */
  signerIds: readonly string[];
};

export type DecisionOptions =
  | { ok: true; step: number; role: StepRole; final: boolean; allowed: ChainDecisionKind[] }
  | { ok: false; refusal: Refusal; step: number | null; role: StepRole | null };

const WAITING: readonly ApplicationState[] = ["submitted", "in_review"];

/** The step the application waits at and its signer's role, or null when it waits for none. */
export function pendingStep(application: Pick<PolicyApplication, "state" | "tier" | "chainStep">, rules: ChainRules) {
  if (!WAITING.includes(application.state) || application.tier === null) return null;
  const steps = tierChain(rules, application.tier).steps;
  const step = application.chainStep + 1;
  const role = steps[step - 1];
  if (!role) return null;
  return { step, role, final: step === steps.length, total: steps.length };
}

/** Whether the actor holds the role a step needs, for this application's department. */
export function eligibleForStep(actor: PolicyActor, role: StepRole, departmentId: string): boolean {
  if (role === "reviewer") {
    // The department's own safety contact: a reviewer of another department may not sign.
    return (
      rolesHave(actor.roles, "application.review") && actor.departmentId !== null && actor.departmentId === departmentId
    );
  }
  return rolesHave(actor.roles, "permit.approve");
}

export function decisionOptions(input: PolicyInput): DecisionOptions {
  const { application, rules, actor } = input;
  if (!WAITING.includes(application.state)) {
    return {
      ok: false,
      step: null,
      role: null,
      refusal: {
        status: 409,
        message: `This application is not waiting for a decision (it is ${application.state.replace("_", " ")}).`,
      },
    };
  }
  if (application.tier === null) {
    return {
      ok: false,
      step: null,
      role: null,
      refusal: { status: 409, message: "This application has no tier yet." },
    };
  }
  const pending = pendingStep(application, rules);
  if (!pending) {
    const selfCertified = tierChain(rules, application.tier).steps.length === 0;
    return {
      ok: false,
      step: null,
      role: null,
      refusal: {
        status: 409,
        message: selfCertified
          ? "Tier 0 needs no review: the application is recorded as self-certified."
          : "This application has every signature its chain needs.",
      },
    };
  }
  if (!eligibleForStep(actor, pending.role, application.departmentId)) {
    return {
      ok: false,
      step: pending.step,
      role: pending.role,
      refusal: {
        status: 403,
        message:
          pending.role === "reviewer"
            ? "This step is signed by a reviewer of the applicant's department."
            : "This step is signed by a safety officer.",
      },
    };
  }
  const sod = separationOfDuties(input);
  if (sod) return { ok: false, step: pending.step, role: pending.role, refusal: sod };
  return {
    ok: true,
    step: pending.step,
    role: pending.role,
    final: pending.final,
    allowed: pending.final ? ["approve", "return", "reject"] : ["recommend", "return"],
  };
}

/** decisionOptions narrowed to one kind: the step to record it at, or the refusal. */
export function checkDecision(input: PolicyInput, kind: ChainDecisionKind): DecisionOptions {
  const options = decisionOptions(input);
  if (!options.ok || options.allowed.includes(kind)) return options;
  const label = STEP_ROLE_LABELS[options.role].toLowerCase();
  return {
    ok: false,
    step: options.step,
    role: options.role,
    refusal: {
      status: 403,
      message: options.final
        ? `At this step the ${label} approves, returns or rejects.`
        : `At this step the ${label} recommends or returns; the final approval comes at a later step.`,
    },
  };
}
