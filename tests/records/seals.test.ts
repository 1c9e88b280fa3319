import { execFileSync } from "node:child_process";
import { and, eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, decisions, permits } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { decisionHmac, sealPayload } from "@/lib/records/seal";
import { auditRowHash, permitSeals, verifyAuditChain, verifyDecisions } from "@/lib/records/verify";
import { decide } from "@/lib/review/decide";
import { createUser, ownerDb, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { http, signIn } from "../support/http";
import { asActor, createSubmittedApplication, createTeam } from "../review/support";

requireDatabase();

// Issue 14, tamper evidence: the audit hash chain (trigger of migration 0008) and the HMAC seal on
// every decision. Tampering is done as the owner role inside a transaction that is rolled back, so
// the shared test database stays intact for the files after this one; the page checks commit a
// change and put it back.

async function approved(extraConditions: string[] = []) {
  const team = await createTeam();
  const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 1 });
  const result = await decide(asActor(team.reviewer), application.id, {
    kind: "approve",
    expectedVersion: application.version,
    password: TEST_PASSWORD,
    confirmedRequirements: [],
    extraConditions,
  });
  const [decision] = await getDb()
    .select()
    .from(decisions)
    .where(and(eq(decisions.revisionId, result.permit!.revisionId), eq(decisions.kind, "approve")));
  return { team, application, permit: result.permit!, decision };
}

/** Runs `fn` as the owner in a transaction that is always rolled back. */
async function tamperAndRollBack(
  fn: (tx: Parameters<Parameters<ReturnType<typeof ownerDb>["transaction"]>[0]>[0]) => Promise<void>,
) {
  await ownerDb()
    .transaction(async (tx) => {
      await fn(tx);
      throw new Error("rollback");
    })
    .catch((error: Error) => {
      if (error.message !== "rollback") throw error;
    });
}

describe("decision seals", () => {
  it("is the HMAC-SHA-256 that OpenSSL computes over the canonical decision (independent implementation)", async () => {
    const { decision } = await approved(["Barrier at 1.5 m"]);
    const key = process.env.DECISION_HMAC_KEY!;
    // openssl dgst -sha256 -hmac: RFC 2104 HMAC by another implementation than node:crypto's caller.
    const out = execFileSync("openssl", ["dgst", "-sha256", "-hmac", key, "-r"], { input: sealPayload(decision) });
    expect(decision.hmac).toBe(`v1:${out.toString().split(" ")[0]}`);
    expect(decision.validFrom).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(decision.conditions).toContain("Barrier at 1.5 m");
    // Each sealed field changes the seal.
    for (const change of [
      { kind: "reject" as const },
      { signerName: "Someone else" },
      { signedAt: new Date(decision.signedAt.getTime() + 1) },
      { contentHash: "0".repeat(64) },
      { conditions: [] },
      { validTo: "2099-12-31" },
      { validityReason: "A rehearsal on the day before." },
    ]) {
      expect(decisionHmac({ ...decision, ...change }), JSON.stringify(change)).not.toBe(decision.hmac);
    }
  });

  it("the verifier names the first decision whose seal no longer matches, and the permit stops checking out", async () => {
    const { permit, decision } = await approved();
    expect(await permitSeals(getDb(), permit.id)).toEqual({ ok: true, signatures: 1 });
    await tamperAndRollBack(async (tx) => {
      await tx.update(decisions).set({ signerName: "Forged Name" }).where(eq(decisions.id, decision.id));
      const report = await verifyDecisions(tx);
      expect(report.firstBreak?.where).toContain(decision.id);
      expect(report.firstBreak?.reason).toMatch(/seal does not match/);
      const seals = await permitSeals(tx, permit.id);
      expect(seals.ok).toBe(false);
    });
    await tamperAndRollBack(async (tx) => {
      await tx.update(permits).set({ validTo: "2099-12-31" }).where(eq(permits.id, permit.id));
      const seals = await permitSeals(tx, permit.id);
      expect(seals).toMatchObject({ ok: false });
      expect(!seals.ok && seals.reason).toMatch(/validity differs/);
    });
    await tamperAndRollBack(async (tx) => {
      await tx.update(permits).set({ validityReason: "Open all summer." }).where(eq(permits.id, permit.id));
      const seals = await permitSeals(tx, permit.id);
      expect(!seals.ok && seals.reason).toMatch(/reason for its validity differs/);
    });
    expect((await verifyDecisions(getDb())).firstBreak).toBeNull();
  });
});

describe("the audit hash chain", () => {
  it("chains 40 concurrent appends without a fork or a gap, and TypeScript recomputes each hash", async () => {
    const tag = uniq("chain");
    await Promise.all(
      Array.from({ length: 40 }, (_, i) =>
        getDb().transaction((tx) =>
          writeAudit(tx, {
            actor: null,
            action: "test.chain",
            entityType: "test",
            entityId: `${tag}-${i}`,
            data: { i, note: "ü ∑ 𝛀" },
          }),
        ),
      ),
    );
    const rows = await getDb()
      .select()
      .from(auditEvents)
      .where(sql`${auditEvents.entityId} LIKE ${tag + "-%"}`)
      .orderBy(auditEvents.chainSeq);
    expect(rows).toHaveLength(40);
    expect(new Set(rows.map((r) => r.prevHash)).size).toBe(40);
    const report = await verifyAuditChain(getDb());
    expect(report.firstBreak).toBeNull();
    expect(report.head?.seq).toBe(report.rows);
  });

  it("reports the first altered, removed or inserted event", async () => {
    const id = uniq("victim");
    await writeAudit(getDb(), { actor: null, action: "test.victim", entityType: "test", entityId: id });
    await writeAudit(getDb(), { actor: null, action: "test.after", entityType: "test", entityId: uniq("after") });
    const [victim] = await getDb().select().from(auditEvents).where(eq(auditEvents.entityId, id));
    const disable = sql`ALTER TABLE audit_event DISABLE TRIGGER audit_event_no_update_delete`;

    await tamperAndRollBack(async (tx) => {
      await tx.execute(disable);
      await tx.execute(sql`UPDATE audit_event SET action = 'test.innocent' WHERE id = ${victim.id}`);
      const report = await verifyAuditChain(tx);
      expect(report.firstBreak?.where).toContain(`#${victim.id} `);
      expect(report.firstBreak?.reason).toMatch(/no longer matches its hash/);
    });
    await tamperAndRollBack(async (tx) => {
      await tx.execute(disable);
      await tx.execute(sql`DELETE FROM audit_event WHERE id = ${victim.id}`);
      const report = await verifyAuditChain(tx);
      expect(report.firstBreak?.reason).toMatch(new RegExp(`link ${victim.chainSeq} is missing`));
    });
    await tamperAndRollBack(async (tx) => {
      // Rewriting one row's hash to match its new content still breaks the link after it.
      await tx.execute(disable);
      const forgedHash = auditRowHash(victim.prevHash, {
        chainSeq: String(victim.chainSeq),
        id: String(victim.id),
        at: "2020-01-01T00:00:00.000000Z",
        actorId: null,
        actorName: "system",
        action: "test.victim",
        entityType: "test",
        entityId: id,
        data: "{}",
      });
      await tx.execute(
        sql`UPDATE audit_event SET occurred_at = '2020-01-01T00:00:00Z', hash = ${forgedHash} WHERE id = ${victim.id}`,
      );
      const report = await verifyAuditChain(tx);
      expect(report.firstBreak?.where).toContain(`link ${victim.chainSeq + 1},`);
      expect(report.firstBreak?.reason).toMatch(/does not point at the hash/);
    });
    expect((await verifyAuditChain(getDb())).firstBreak).toBeNull();
  });
});

describe("pages say whether the signatures check out", () => {
  it("the public status page and /admin/records, before and after a forged validity", async () => {
    const { permit } = await approved();
    const page = async () => (await http(`/verify/${permit.verificationCode}`)).text.replace(/<!-- -->/g, "");
    expect(await page()).toMatch(/The signatures check out\./);
    const admin = await createUser({ roles: ["admin"] });
    const cookie = await signIn(admin.email);
    const records = async () => (await http("/admin/records", { cookie })).text.replace(/<!-- -->/g, "");
    expect(await records()).not.toMatch(/Broken at/);

    const original = permit.validTo;
    await ownerDb().update(permits).set({ validTo: "2099-12-31" }).where(eq(permits.id, permit.id));
    try {
      const forged = await page();
      expect(forged).toMatch(/The signatures do not check out\./);
      expect(forged).not.toMatch(/The signatures check out\./);
      expect(await records()).toMatch(/Broken at decision/);
    } finally {
      await ownerDb().update(permits).set({ validTo: original }).where(eq(permits.id, permit.id));
    }
    expect(await page()).toMatch(/The signatures check out\./);
  });
});
