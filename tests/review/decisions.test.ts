import { and, eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applicationRevisions, applications, auditEvents, decisions, mailOutbox, permits } from "@/db/schema";
import { assessSetup, type Tier } from "@/lib/hazard";
import { AppError } from "@/lib/errors";
import { inclusiveDays } from "@/lib/permits/dates";
import { revokePermit } from "@/lib/permits/revoke";
import { sealMatches } from "@/lib/records/seal";
import { permitSeals } from "@/lib/records/verify";
import { decide } from "@/lib/review/decide";
import { revisionHash } from "@/lib/signing/canonical";
import { DECISION_MEANINGS } from "@/lib/signing/meanings";
import { returnCommentsFor } from "@/lib/review/queries";
import type { DecisionBody } from "@/lib/review/schemas";
import { DEFAULT_CHAIN_RULES } from "@/lib/rules/chain";
import { permitPrefix } from "@/lib/settings/queries";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import {
  asActor,
  createOfficer,
  createSubmittedApplication,
  createTeam,
  isoDayFromNow,
  reload,
  resubmit,
  TIER_SETUPS,
} from "./support";

requireDatabase();

/** The status an AppError carries, or "ok" when the call succeeds. */
async function outcome(promise: Promise<unknown>): Promise<number | "ok"> {
  try {
    await promise;
    return "ok";
  } catch (error) {
    if (error instanceof AppError) return error.status;
    throw error;
  }
}

async function errorOf(promise: Promise<unknown>): Promise<AppError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof AppError) return error;
    throw error;
  }
  throw new Error("expected an AppError");
}

const approveBody = (
  version: number,
  extra: Partial<Extract<DecisionBody, { kind: "approve" }>> = {},
): DecisionBody => ({
  kind: "approve",
  expectedVersion: version,
  password: TEST_PASSWORD,
  confirmedRequirements: [],
  extraConditions: [],
  ...extra,
});

const allRequirements = (tier: Tier) => DEFAULT_CHAIN_RULES.tiers[tier].requirements.map((r) => r.id);

describe("fixtures", () => {
  it("gives each tier's set-up the tier it is named for", () => {
    for (const tier of [0, 1, 2, 3, 4] as const) expect(assessSetup(TIER_SETUPS[tier]).tier).toBe(tier);
  });

  it("freezes revisions whose stored content still hashes to contentHash", async () => {
    const team = await createTeam();
    const { revisionId, contentHash } = await createSubmittedApplication({ applicant: team.instructor, tier: 2 });
    const [rev] = await getDb().select().from(applicationRevisions).where(eq(applicationRevisions.id, revisionId));
    expect(revisionHash(rev.content, rev.assessment)).toBe(contentHash);
  });
});

describe("tier 0: recorded, self-certified (product.md default rules)", () => {
  it("approves at submission with a permit for the event days and no signature", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({
      applicant: team.instructor,
      tier: 0,
      firstDay: isoDayFromNow(10),
      lastDay: isoDayFromNow(12),
    });
    expect(application.state).toBe("approved");
    const [permit] = await getDb().select().from(permits).where(eq(permits.applicationId, application.id));
    // product.md: PREFIX-YYYY-NNNN, the prefix from the institution settings (default HV).
    expect(permit.number).toBe(`${await permitPrefix()}-${permit.year}-${String(permit.seq).padStart(4, "0")}`);
    // issue 20: a permit covers the days the applicant asked for, not the tier's longest validity.
    expect(permit).toMatchObject({ validFrom: isoDayFromNow(10), validTo: isoDayFromNow(12), validityReason: null });
    expect(permit.holderId).toBe(team.instructor.id);
    expect(await getDb().select().from(decisions).where(eq(decisions.applicationId, application.id))).toEqual([]);
    const audit = await getDb()
      .select({ action: auditEvents.action })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityType, "application"), eq(auditEvents.entityId, application.id)));
    expect(audit.map((a) => a.action)).toEqual(["application.submitted", "application.self_certified"]);
    // Nobody can decide on it afterwards.
    expect(await outcome(decide(asActor(team.officer), application.id, approveBody(application.version)))).toBe(409);
  });
});

describe("tier 1: one reviewer of the applicant's department, whose approval is final", () => {
  it("issues the permit on the reviewer's approval, for the event days", async () => {
    const team = await createTeam();
    const { application, contentHash } = await createSubmittedApplication({
      applicant: team.instructor,
      tier: 1,
      firstDay: isoDayFromNow(7),
      lastDay: isoDayFromNow(8),
    });
    expect(application.state).toBe("submitted");
    // The safety officer is not part of a tier-1 chain.
    expect(await outcome(decide(asActor(team.officer), application.id, approveBody(application.version)))).toBe(403);
    const result = await decide(asActor(team.reviewer), application.id, approveBody(application.version));
    expect(result.application.state).toBe("approved");
    expect(result.decision).toMatchObject({
      kind: "approve",
      step: 1,
      signerName: team.reviewer.name,
      signerRole: "Reviewer",
      meaning: DECISION_MEANINGS.approve,
      contentHash,
    });
    expect(result.permit).toMatchObject({ validFrom: isoDayFromNow(7), validTo: isoDayFromNow(8) });
    expect(result.decision).toMatchObject({ validFrom: isoDayFromNow(7), validTo: isoDayFromNow(8) });
  });
});

describe("tiers 2–4: reviewer recommends, then the safety officer approves", () => {
  for (const tier of [2, 3, 4] as const) {
    it(`runs the tier-${tier} chain to an active permit with the tier's conditions`, async () => {
      const team = await createTeam();
      const { application, contentHash, revisionId } = await createSubmittedApplication({
        applicant: team.instructor,
        tier,
      });
      const rec = await decide(asActor(team.reviewer), application.id, {
        kind: "recommend",
        expectedVersion: application.version,
        comment: "Figures checked.",
      });
      expect(rec.application).toMatchObject({ state: "in_review", chainStep: 1 });
      expect(rec.decision).toMatchObject({ kind: "recommend", step: 1, signerRole: "Reviewer", contentHash });

      const result = await decide(
        asActor(team.officer),
        application.id,
        approveBody(rec.application.version, {
          confirmedRequirements: allRequirements(tier),
          extraConditions: ["Doors closed during operation."],
        }),
      );
      expect(result.application).toMatchObject({ state: "approved", chainStep: 2 });
      expect(result.decision).toMatchObject({
        kind: "approve",
        step: 2,
        signerRole: "Safety officer",
        revisionId,
        contentHash,
      });
      // The fixture's event: a week from now, two days long (tests/review/support.ts).
      expect(result.permit).toMatchObject({ validFrom: isoDayFromNow(7), validTo: isoDayFromNow(8) });
      expect(result.permit!.conditions).toEqual([
        ...DEFAULT_CHAIN_RULES.tiers[tier].requirements.map((r) => r.text),
        "Doors closed during operation.",
      ]);
      expect(result.permit!.verificationCode).toMatch(/^[A-Za-z0-9_-]{43}$/);
    });
  }

  it("refuses a final approval that leaves a tier requirement unconfirmed (422 on confirmedRequirements)", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 3 });
    const rec = await decide(asActor(team.reviewer), application.id, {
      kind: "recommend",
      expectedVersion: application.version,
    });
    const error = await errorOf(
      decide(
        asActor(team.officer),
        application.id,
        approveBody(rec.application.version, { confirmedRequirements: allRequirements(3).slice(1) }),
      ),
    );
    expect(error.status).toBe(422);
    expect(error.details.issues?.[0].path).toBe("confirmedRequirements");
    expect((await reload(application.id)).state).toBe("in_review");
  });

  it("lets the officer shorten the validity window but never lengthen it or start it in the past", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 3 });
    const rec = await decide(asActor(team.reviewer), application.id, {
      kind: "recommend",
      expectedVersion: application.version,
    });
    const v = rec.application.version;
    const officer = asActor(team.officer);
    const today = new Date().toISOString().slice(0, 10);
    const plus = (d: number) => new Date(Date.now() + d * 86_400_000).toISOString().slice(0, 10);
    const tooLong = await errorOf(
      decide(
        officer,
        application.id,
        approveBody(v, { confirmedRequirements: allRequirements(3), validFrom: plus(2), validTo: plus(2 + 90) }),
      ),
    );
    expect(tooLong.details.issues?.[0].path).toBe("validTo");
    const past = await errorOf(
      decide(
        officer,
        application.id,
        approveBody(v, { confirmedRequirements: allRequirements(3), validFrom: plus(-3), validTo: plus(5) }),
      ),
    );
    expect(past.details.issues?.[0].path).toBe("validFrom");
    const reversed = await errorOf(
      decide(
        officer,
        application.id,
        approveBody(v, { confirmedRequirements: allRequirements(3), validFrom: plus(5), validTo: plus(4) }),
      ),
    );
    expect(reversed.details.issues?.[0].path).toBe("validTo");
    const ok = await decide(
      officer,
      application.id,
      approveBody(v, {
        confirmedRequirements: allRequirements(3),
        validFrom: plus(1),
        validTo: plus(14),
        validityReason: "Rehearsals in the week before.",
      }),
    );
    expect(ok.permit).toMatchObject({ validFrom: plus(1), validTo: plus(14) });
    expect(today <= ok.permit!.validFrom).toBe(true);
  });
});

describe("the permit is for the event (issue 20, item 1)", () => {
  async function recommended(options: { firstDay: string; lastDay: string; tier?: 2 | 3 | 4 }) {
    const team = await createTeam();
    const tier = options.tier ?? 3;
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier, ...options });
    const rec = await decide(asActor(team.reviewer), application.id, {
      kind: "recommend",
      expectedVersion: application.version,
    });
    return { team, application, version: rec.application.version, tier };
  }

  it("defaults the window to the event days: an evening event gets a one-day permit", async () => {
    // The outreach evening of the issue: one day, three weeks ahead.
    const day = isoDayFromNow(21);
    const { team, application, version } = await recommended({ firstDay: day, lastDay: day });
    const result = await decide(
      asActor(team.officer),
      application.id,
      approveBody(version, { confirmedRequirements: allRequirements(3) }),
    );
    expect(result.permit).toMatchObject({ validFrom: day, validTo: day, validityReason: null });
    expect(inclusiveDays(result.permit!.validFrom, result.permit!.validTo)).toBe(1);
  });

  it("lets the approver narrow the window without a reason", async () => {
    const { team, application, version } = await recommended({
      firstDay: isoDayFromNow(10),
      lastDay: isoDayFromNow(14),
    });
    const result = await decide(
      asActor(team.officer),
      application.id,
      approveBody(version, {
        confirmedRequirements: allRequirements(3),
        validFrom: isoDayFromNow(11),
        validTo: isoDayFromNow(12),
      }),
    );
    expect(result.permit).toMatchObject({ validFrom: isoDayFromNow(11), validTo: isoDayFromNow(12) });
  });

  it("refuses a window beyond the event days without a reason, and stores, audits and signs the reason given", async () => {
    const { team, application, version } = await recommended({
      firstDay: isoDayFromNow(10),
      lastDay: isoDayFromNow(10),
    });
    const officer = asActor(team.officer);
    const wider = { validFrom: isoDayFromNow(3), validTo: isoDayFromNow(10) };
    const refused = await errorOf(
      decide(officer, application.id, approveBody(version, { confirmedRequirements: allRequirements(3), ...wider })),
    );
    expect(refused.status).toBe(422);
    expect(refused.details.issues?.[0].path).toBe("validityReason");
    expect((await reload(application.id)).state).toBe("in_review");

    const reason = "Two rehearsals in the hall during the week before.";
    const result = await decide(
      officer,
      application.id,
      approveBody(version, { confirmedRequirements: allRequirements(3), ...wider, validityReason: reason }),
    );
    expect(result.permit).toMatchObject({ ...wider, validityReason: reason });
    // Signed with the decision: the approval row carries the window and its reason.
    expect(result.decision).toMatchObject({ kind: "approve", ...wider, validityReason: reason });
    // …and sealed: the seal covers the reason, and the permit re-checks against it (lib/records).
    expect(sealMatches(result.decision)).toBe(true);
    expect(sealMatches({ ...result.decision, validityReason: "Another reason." })).toBe(false);
    expect(await permitSeals(getDb(), result.permit!.id)).toMatchObject({ ok: true });
    const [audit] = await getDb()
      .select({ data: auditEvents.data })
      .from(auditEvents)
      .where(and(eq(auditEvents.action, "application.approved"), eq(auditEvents.entityId, application.id)));
    expect(audit.data).toMatchObject({ ...wider, validityReason: reason });
  });

  it("never widens past the tier's longest validity, even with a reason", async () => {
    // product.md default rules: tier 4 permits last at most 30 days.
    const { team, application, version } = await recommended({
      firstDay: isoDayFromNow(5),
      lastDay: isoDayFromNow(5),
      tier: 4,
    });
    const error = await errorOf(
      decide(
        asActor(team.officer),
        application.id,
        approveBody(version, {
          confirmedRequirements: allRequirements(4),
          validFrom: isoDayFromNow(5),
          validTo: isoDayFromNow(5 + 30),
          validityReason: "A month of open days.",
        }),
      ),
    );
    expect(error.status).toBe(422);
    expect(error.details.issues?.[0].path).toBe("validTo");
  });

  it("cuts a long event to the tier's longest validity", async () => {
    // Tier 4: 30 days at most (product.md), from the first day of a 60-day teaching block.
    const { team, application, version } = await recommended({
      firstDay: isoDayFromNow(2),
      lastDay: isoDayFromNow(61),
      tier: 4,
    });
    const result = await decide(
      asActor(team.officer),
      application.id,
      approveBody(version, { confirmedRequirements: allRequirements(4) }),
    );
    expect(result.permit).toMatchObject({ validFrom: isoDayFromNow(2), validTo: isoDayFromNow(31) });
  });
});

describe("who may take which decision, by role and state", () => {
  type Who = "applicant" | "reviewer" | "otherDeptReviewer" | "officer" | "admin";
  const kinds = ["recommend", "return", "approve", "reject"] as const;
  const bodyFor = (kind: (typeof kinds)[number], version: number, tier: Tier): DecisionBody =>
    kind === "recommend"
      ? { kind, expectedVersion: version }
      : kind === "return"
        ? { kind, expectedVersion: version, comment: "Please add the bleeder value." }
        : kind === "approve"
          ? approveBody(version, { confirmedRequirements: allRequirements(tier) })
          : { kind, expectedVersion: version, password: TEST_PASSWORD, comment: "Not at this audience size." };

  // Expected outcomes for a tier-3 application at each waiting step. 403 = not this person or not
  // this decision at this step; the application.review permission gate turns instructors and admins
  // away; a reviewer of another department cannot see the application at all (404).
  const expected: Record<"step1" | "step2", Record<Who, Record<(typeof kinds)[number], number | "ok">>> = {
    step1: {
      applicant: { recommend: 403, return: 403, approve: 403, reject: 403 },
      reviewer: { recommend: "ok", return: "ok", approve: 403, reject: 403 },
      otherDeptReviewer: { recommend: 404, return: 404, approve: 404, reject: 404 },
      officer: { recommend: 403, return: 403, approve: 403, reject: 403 },
      admin: { recommend: 403, return: 403, approve: 403, reject: 403 },
    },
    step2: {
      applicant: { recommend: 403, return: 403, approve: 403, reject: 403 },
      reviewer: { recommend: 403, return: 403, approve: 403, reject: 403 },
      otherDeptReviewer: { recommend: 404, return: 404, approve: 404, reject: 404 },
      officer: { recommend: 403, return: "ok", approve: "ok", reject: "ok" },
      admin: { recommend: 403, return: 403, approve: 403, reject: 403 },
    },
  };

  for (const step of ["step1", "step2"] as const) {
    for (const who of Object.keys(expected[step]) as Who[]) {
      for (const kind of kinds) {
        const want = expected[step][who][kind];
        it(`${step}: ${who} ${kind} → ${want}`, async () => {
          const team = await createTeam();
          const admin = await createUser({ roles: ["admin"], departmentId: team.dept.id });
          const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 3 });
          let version = application.version;
          if (step === "step2") {
            version = (
              await decide(asActor(team.reviewer), application.id, { kind: "recommend", expectedVersion: version })
            ).application.version;
          }
          const actor = {
            applicant: team.instructor,
            reviewer: team.reviewer,
            otherDeptReviewer: team.otherReviewer,
            officer: team.officer,
            admin,
          }[who];
          const before = await reload(application.id);
          const got = await outcome(decide(asActor(actor), application.id, bodyFor(kind, version, 3)));
          expect(got).toBe(want);
          const after = await reload(application.id);
          if (want === "ok") {
            expect(after.version).toBe(before.version + 1);
          } else {
            // A refusal changes nothing.
            expect(after).toEqual(before);
          }
        });
      }
    }
  }

  for (const state of ["returned", "approved", "rejected"] as const) {
    it(`refuses every decision on a ${state} application with 409`, async () => {
      const team = await createTeam();
      const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 1 });
      const end =
        state === "returned"
          ? await decide(asActor(team.reviewer), application.id, {
              kind: "return",
              expectedVersion: application.version,
              comment: "Dates?",
            })
          : state === "approved"
            ? await decide(asActor(team.reviewer), application.id, approveBody(application.version))
            : await decide(asActor(team.reviewer), application.id, {
                kind: "reject",
                expectedVersion: application.version,
                password: TEST_PASSWORD,
                comment: "Out of scope.",
              });
      expect(end.application.state).toBe(state);
      for (const kind of kinds) {
        expect(
          await outcome(decide(asActor(team.reviewer2), application.id, bodyFor(kind, end.application.version, 1))),
        ).toBe(409);
      }
    });
  }

  it("refuses a withdrawn application with 409 and hides a draft (404)", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 1 });
    await getDb().update(applications).set({ state: "withdrawn" }).where(eq(applications.id, application.id));
    expect(await outcome(decide(asActor(team.reviewer), application.id, approveBody(application.version)))).toBe(409);
    const [draft] = await getDb()
      .insert(applications)
      .values({ title: "Draft", applicantId: team.instructor.id, departmentId: team.dept.id })
      .returning();
    expect(await outcome(decide(asActor(team.reviewer), draft.id, approveBody(draft.version)))).toBe(404);
  });

  it("answers 409 for a stale expectedVersion", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 2 });
    expect(
      await outcome(
        decide(asActor(team.reviewer), application.id, { kind: "recommend", expectedVersion: application.version - 1 }),
      ),
    ).toBe(409);
  });
});

describe("separation of duties", () => {
  it("refuses a reviewer deciding on an application they submitted", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.reviewer, tier: 3 });
    const error = await errorOf(
      decide(asActor(team.reviewer), application.id, { kind: "recommend", expectedVersion: application.version }),
    );
    expect(error.status).toBe(403);
    expect(error.message).toMatch(/submitted this application/);
    // Another reviewer of the department may.
    expect(
      await outcome(
        decide(asActor(team.reviewer2), application.id, { kind: "recommend", expectedVersion: application.version }),
      ),
    ).toBe("ok");
  });

  it("refuses an officer named on the application", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({
      applicant: team.instructor,
      tier: 2,
      namedUserIds: [team.officer.id],
      operators: [{ id: team.officer.id, name: team.officer.name }],
    });
    const rec = await decide(asActor(team.reviewer), application.id, {
      kind: "recommend",
      expectedVersion: application.version,
    });
    const error = await errorOf(
      decide(
        asActor(team.officer),
        application.id,
        approveBody(rec.application.version, { confirmedRequirements: allRequirements(2) }),
      ),
    );
    expect(error.status).toBe(403);
    expect(error.message).toMatch(/named on this application/);
    expect(
      await outcome(
        decide(
          asActor(team.officer2),
          application.id,
          approveBody(rec.application.version, { confirmedRequirements: allRequirements(2) }),
        ),
      ),
    ).toBe("ok");
  });

  it("refuses one person signing both steps of a chain, even holding both roles", async () => {
    const team = await createTeam();
    const both = await createOfficer({ roles: ["reviewer", "safety_officer"], departmentId: team.dept.id });
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 3 });
    const rec = await decide(asActor(both), application.id, {
      kind: "recommend",
      expectedVersion: application.version,
    });
    const error = await errorOf(
      decide(
        asActor(both),
        application.id,
        approveBody(rec.application.version, { confirmedRequirements: allRequirements(3) }),
      ),
    );
    expect(error.status).toBe(403);
    expect(error.message).toMatch(/already signed/);
  });

  it("lets the reviewer who returned revision 1 sign revision 2: a new revision is a new chain", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 3 });
    const ret = await decide(asActor(team.reviewer), application.id, {
      kind: "return",
      expectedVersion: application.version,
      comment: "Add a bleeder across the bank.",
      pinnedTo: "apparatus.setup.sources[0].bleeder_ohm",
    });
    expect(ret.application).toMatchObject({ state: "returned", chainStep: 0 });
    expect(ret.decision).toMatchObject({ kind: "return", step: 1, pinnedTo: "apparatus.setup.sources[0].bleeder_ohm" });
    // The edit page reads the pinned comment while the application is returned.
    expect(await returnCommentsFor(asActor(team.instructor), application.id)).toEqual([
      expect.objectContaining({
        comment: "Add a bleeder across the bank.",
        pinnedTo: "apparatus.setup.sources[0].bleeder_ohm",
        signerRole: "Reviewer",
      }),
    ]);
    expect(await returnCommentsFor(asActor(team.otherReviewer), application.id)).toEqual([]);
    const second = await resubmit(application, team.instructor, (c) => c);
    expect(await returnCommentsFor(asActor(team.instructor), application.id)).toEqual([]);
    expect(second.application).toMatchObject({ state: "submitted", chainStep: 0 });
    const rec = await decide(asActor(team.reviewer), application.id, {
      kind: "recommend",
      expectedVersion: second.application.version,
    });
    expect(rec.decision.revisionId).toBe(second.revisionId);
  });
});

describe("password re-entry", () => {
  it("refuses approve and reject with a wrong password (422 on password) and records nothing", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 1 });
    for (const body of [
      approveBody(application.version, { password: "not my password" }),
      {
        kind: "reject",
        expectedVersion: application.version,
        password: "not my password",
        comment: "No.",
      } as DecisionBody,
    ]) {
      const error = await errorOf(decide(asActor(team.reviewer), application.id, body));
      expect(error.status).toBe(422);
      expect(error.details.issues).toEqual([{ path: "password", message: "The password is not correct." }]);
    }
    expect(await reload(application.id)).toMatchObject({ state: "submitted", version: application.version });
    expect(await getDb().select().from(decisions).where(eq(decisions.applicationId, application.id))).toEqual([]);
  });

  it("refuses a revoke with a wrong password", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 1 });
    const { permit } = await decide(asActor(team.reviewer), application.id, approveBody(application.version));
    const error = await errorOf(
      revokePermit(asActor(team.officer), permit!.id, {
        expectedVersion: permit!.version,
        password: "wrong",
        reason: "Unsafe wiring.",
      }),
    );
    expect(error.status).toBe(422);
    expect(error.details.issues?.[0].path).toBe("password");
    const [still] = await getDb().select({ state: permits.state }).from(permits).where(eq(permits.id, permit!.id));
    expect(still.state).toBe("active");
  });
});

describe("mail and audit rows of each decision", () => {
  it("queues returned → applicant, recommended → officers, approved → holder, with one audit row each", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 3 });
    const ret = await decide(asActor(team.reviewer), application.id, {
      kind: "return",
      expectedVersion: application.version,
      comment: "Barrier?",
    });
    const second = await resubmit(application, team.instructor, (c) => ({
      ...c,
      controls: { ...c.controls, additional: "Barrier at 1.5 m." },
    }));
    expect(second.application.version).toBeGreaterThan(ret.application.version);
    const rec = await decide(asActor(team.reviewer), application.id, {
      kind: "recommend",
      expectedVersion: second.application.version,
    });
    const app = await decide(
      asActor(team.officer),
      application.id,
      approveBody(rec.application.version, { confirmedRequirements: allRequirements(3) }),
    );

    const mail = await getDb()
      .select({ kind: mailOutbox.kind, to: mailOutbox.toAddress, data: mailOutbox.data })
      .from(mailOutbox)
      .where(sql`${mailOutbox.data} ->> 'applicationId' = ${application.id}`)
      .orderBy(mailOutbox.id);
    const mine = mail;
    expect(mine.filter((m) => m.kind === "application_returned").map((m) => m.to)).toEqual([team.instructor.email]);
    const recommended = mine.filter((m) => m.kind === "application_recommended").map((m) => m.to);
    expect(recommended).toEqual(expect.arrayContaining([team.officer.email, team.officer2.email]));
    expect(recommended).not.toContain(team.instructor.email);
    expect(mine.filter((m) => m.kind === "application_approved").map((m) => m.to)).toEqual([team.instructor.email]);
    expect(mine.find((m) => m.kind === "application_approved")?.data).toMatchObject({
      permitNumber: app.permit!.number,
    });

    const audit = await getDb()
      .select({ action: auditEvents.action, data: auditEvents.data })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityType, "application"), eq(auditEvents.entityId, application.id)));
    expect(audit.map((a) => a.action)).toEqual([
      "application.submitted",
      "application.returned",
      "application.submitted",
      "application.recommended",
      "application.approved",
    ]);
    expect(audit.at(-1)?.data).toMatchObject({
      permitNumber: app.permit!.number,
      contentHash: second.contentHash,
      step: 2,
    });
  });
});
