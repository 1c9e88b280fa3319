import crypto from "node:crypto";
import type { DecisionKind } from "@/db/schema";
import { env } from "@/lib/env";
import { canonicalJson } from "@/lib/signing/canonical";

// The seal on a signed decision: HMAC-SHA-256 with DECISION_HMAC_KEY (from the environment, never
// stored in the database) over what was decided — which decision, on which revision (and the hash of
// that revision's content), its kind and step, who signed (id, printed name, role), what the
// signature means, when (UTC, milliseconds), the conditions and the validity an approval granted (first and last day, and the reason when
// it reaches beyond the event days).
// Someone who can write the database but does not hold the key cannot change any of these, move a
// signature to another revision, or add a decision, without the verifier noticing.
// Stored as "v1:<hex>", so a later format or key can be told apart.

export type SealableDecision = {
  id: string;
  applicationId: string;
  revisionId: string;
  kind: DecisionKind;
  step: number | null;
  signerId: string;
  signerName: string;
  signerRole: string;
  meaning: string;
  contentHash: string;
  conditions: string[] | null;
  validFrom: string | null;
  validTo: string | null;
  validityReason: string | null;
  signedAt: Date;
};

export const SEAL_VERSION = "v1";

/** The key from the environment (lib/env.ts validates it: 32+ characters). */
export function sealKey(): string {
  return env().DECISION_HMAC_KEY;
}

/** The exact bytes the HMAC covers (canonical JSON, keys sorted). */
export function sealPayload(d: SealableDecision): string {
  return canonicalJson({
    v: SEAL_VERSION,
    id: d.id,
    applicationId: d.applicationId,
    revisionId: d.revisionId,
    kind: d.kind,
    step: d.step ?? null,
    signerId: d.signerId,
    signerName: d.signerName,
    signerRole: d.signerRole,
    meaning: d.meaning,
    contentHash: d.contentHash,
    conditions: d.conditions ?? null,
    validFrom: d.validFrom ?? null,
    validTo: d.validTo ?? null,
    validityReason: d.validityReason ?? null,
    signedAt: d.signedAt.toISOString(),
  });
}

export function decisionHmac(d: SealableDecision, key: string = sealKey()): string {
  return `${SEAL_VERSION}:${crypto.createHmac("sha256", key).update(sealPayload(d), "utf8").digest("hex")}`;
}

/** Constant-time comparison of a stored seal with the one the key gives now. */
export function sealMatches(d: SealableDecision & { hmac: string | null }, key: string = sealKey()): boolean {
  if (!d.hmac) return false;
  const want = Buffer.from(decisionHmac(d, key));
  const have = Buffer.from(d.hmac);
  return want.length === have.length && crypto.timingSafeEqual(want, have);
}

/**
 * Gives a decision about to be inserted its id, time and seal. Use for every insert into `decision`
 * (the column is NOT NULL, so an unsealed insert fails).
 */
export function sealDecision<
  T extends Omit<SealableDecision, "id" | "signedAt" | "conditions" | "validFrom" | "validTo" | "validityReason"> & {
    id?: string;
    signedAt?: Date;
    conditions?: string[] | null;
    validFrom?: string | null;
    validTo?: string | null;
    validityReason?: string | null;
  },
>(
  values: T,
  key: string = sealKey(),
): T & {
  id: string;
  signedAt: Date;
  conditions: string[] | null;
  validFrom: string | null;
  validTo: string | null;
  validityReason: string | null;
  hmac: string;
} {
  const full = {
    ...values,
    id: values.id ?? crypto.randomUUID(),
    // PostgreSQL keeps microseconds, JavaScript milliseconds: seal what reads back.
    signedAt: new Date(Math.floor((values.signedAt ?? new Date()).getTime())),
    conditions: values.conditions ?? null,
    validFrom: values.validFrom ?? null,
    validTo: values.validTo ?? null,
    validityReason: values.validityReason ?? null,
  };
  return { ...full, hmac: decisionHmac(full, key) };
}
