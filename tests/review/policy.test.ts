import { describe, expect, it } from "vitest";
import { APPLICATION_STATES, type ApplicationState, type Role } from "@/db/schema";
import {
  checkDecision,
  decisionOptions,
  pendingStep,
  type ChainDecisionKind,
  type PolicyInput,
} from "@/lib/review/policy";
import { DEFAULT_CHAIN_RULES } from "@/lib/rules/chain";

// The decision policy as a pure function: every application state × every role × every decision
// kind, for a tier-3 application (two-step chain) of department D.

const D = "dept-d";
const E = "dept-e";
const KINDS: ChainDecisionKind[] = ["recommend", "return", "approve", "reject"];

const people: Record<string, { id: string; roles: Role[]; departmentId: string | null }> = {
  applicant: { id: "u-applicant", roles: ["instructor"], departmentId: D },
  reviewer: { id: "u-reviewer", roles: ["reviewer"], departmentId: D },
  reviewerElsewhere: { id: "u-reviewer-e", roles: ["reviewer"], departmentId: E },
  reviewerNoDept: { id: "u-reviewer-none", roles: ["reviewer"], departmentId: null },
  officer: { id: "u-officer", roles: ["safety_officer"], departmentId: E },
  admin: { id: "u-admin", roles: ["admin"], departmentId: D },
};

function input(who: keyof typeof people, state: ApplicationState, chainStep: number, tier = 3): PolicyInput {
  return {
    actor: people[who],
    application: { state, tier, chainStep, departmentId: D, applicantId: "u-applicant", namedUserIds: [] },
    rules: DEFAULT_CHAIN_RULES,
    submittedById: "u-applicant",
    signerIds: [],
  };
}

function allowed(who: keyof typeof people, state: ApplicationState, chainStep: number, tier = 3): ChainDecisionKind[] {
  return KINDS.filter((k) => checkDecision(input(who, state, chainStep, tier), k).ok);
}

describe("decision policy", () => {
  it("allows only the department's reviewer at step 1 (recommend or return) and the officer at step 2", () => {
    expect(allowed("reviewer", "submitted", 0)).toEqual(["recommend", "return"]);
    expect(allowed("officer", "in_review", 1)).toEqual(["return", "approve", "reject"]);
    for (const who of ["applicant", "reviewerElsewhere", "reviewerNoDept", "officer", "admin"] as const) {
      expect(allowed(who, "submitted", 0), who).toEqual([]);
    }
    for (const who of ["applicant", "reviewer", "reviewerElsewhere", "reviewerNoDept", "admin"] as const) {
      expect(allowed(who, "in_review", 1), who).toEqual([]);
    }
  });

  it("gives the tier-1 reviewer the final decision and nobody a decision on tier 0", () => {
    expect(allowed("reviewer", "submitted", 0, 1)).toEqual(["return", "approve", "reject"]);
    expect(allowed("officer", "submitted", 0, 1)).toEqual([]);
    const tier0 = decisionOptions(input("officer", "submitted", 0, 0));
    expect(tier0.ok).toBe(false);
    if (!tier0.ok)
      expect(tier0.refusal).toMatchObject({ status: 409, message: expect.stringMatching(/self-certified/) });
  });

  it("refuses every decision in every state that does not wait for one, with 409", () => {
    for (const state of APPLICATION_STATES.filter((s) => s !== "submitted" && s !== "in_review")) {
      for (const who of Object.keys(people) as (keyof typeof people)[]) {
        for (const kind of KINDS) {
          const result = checkDecision(input(who, state, 0), kind);
          expect(result.ok).toBe(false);
          if (!result.ok) expect(result.refusal.status, `${state} ${who} ${kind}`).toBe(409);
        }
      }
    }
  });

  it("answers 403 for the wrong person and for the wrong decision at a step", () => {
    const wrongPerson = checkDecision(input("officer", "submitted", 0), "recommend");
    expect(!wrongPerson.ok && wrongPerson.refusal).toMatchObject({
      status: 403,
      message: expect.stringMatching(/reviewer of the applicant's department/),
    });
    const wrongKind = checkDecision(input("reviewer", "submitted", 0), "approve");
    expect(!wrongKind.ok && wrongKind.refusal).toMatchObject({
      status: 403,
      message: expect.stringMatching(/recommends or returns/),
    });
  });

  it("applies separation of duties: applicant, submitter, named people and earlier signers", () => {
    const base = input("reviewer", "submitted", 0);
    const asApplicant = { ...base, application: { ...base.application, applicantId: "u-reviewer" } };
    expect(decisionOptions(asApplicant)).toMatchObject({ ok: false, refusal: { status: 403 } });
    expect(decisionOptions({ ...base, submittedById: "u-reviewer" })).toMatchObject({
      ok: false,
      refusal: { status: 403 },
    });
    const named = { ...base, application: { ...base.application, namedUserIds: ["u-reviewer"] } };
    expect(decisionOptions(named)).toMatchObject({
      ok: false,
      refusal: { status: 403, message: expect.stringMatching(/named/) },
    });
    const both = { id: "u-both", roles: ["reviewer", "safety_officer"] as Role[], departmentId: D };
    const second = { ...input("officer", "in_review", 1), actor: both, signerIds: ["u-both"] };
    expect(decisionOptions(second)).toMatchObject({
      ok: false,
      refusal: { status: 403, message: expect.stringMatching(/already signed/) },
    });
    expect(decisionOptions({ ...second, signerIds: ["someone-else"] })).toMatchObject({ ok: true, step: 2 });
  });

  it("names the step an application waits at", () => {
    expect(pendingStep({ state: "submitted", tier: 3, chainStep: 0 }, DEFAULT_CHAIN_RULES)).toEqual({
      step: 1,
      role: "reviewer",
      final: false,
      total: 2,
    });
    expect(pendingStep({ state: "in_review", tier: 4, chainStep: 1 }, DEFAULT_CHAIN_RULES)).toEqual({
      step: 2,
      role: "safety_officer",
      final: true,
      total: 2,
    });
    expect(pendingStep({ state: "approved", tier: 4, chainStep: 2 }, DEFAULT_CHAIN_RULES)).toBeNull();
    expect(pendingStep({ state: "submitted", tier: 0, chainStep: 0 }, DEFAULT_CHAIN_RULES)).toBeNull();
  });
});
