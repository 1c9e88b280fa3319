import crypto from "node:crypto";
import { canonicalJson } from "@/lib/signing/canonical";
import { SEAL_VERSION, sealKey } from "./seal";

// The seal on a training exception (issue 17): the final approver lets named operators whose course
// is lapsed or missing operate under one revision's permit, with a reason. Sealed like a decision
// (lib/records/seal.ts): HMAC-SHA-256 with DECISION_HMAC_KEY over what was excepted — the revision
// and the hash of its content, the gaps, the day checked through, the reason, who signed (id, printed
// name, role), what the signature means and when. Stored as "v1:<hex>".

export type SealableTrainingException = {
  id: string;
  applicationId: string;
  revisionId: string;
  throughDay: string;
  gaps: unknown[];
  reason: string;
  signerId: string;
  signerName: string;
  signerRole: string;
  meaning: string;
  contentHash: string;
  signedAt: Date;
};

export function trainingExceptionPayload(e: SealableTrainingException): string {
  return canonicalJson({
    v: SEAL_VERSION,
    type: "training_exception",
    id: e.id,
    applicationId: e.applicationId,
    revisionId: e.revisionId,
    throughDay: e.throughDay,
    gaps: e.gaps,
    reason: e.reason,
    signerId: e.signerId,
    signerName: e.signerName,
    signerRole: e.signerRole,
    meaning: e.meaning,
    contentHash: e.contentHash,
    signedAt: e.signedAt.toISOString(),
  });
}

export function trainingExceptionHmac(e: SealableTrainingException, key: string = sealKey()): string {
  return `${SEAL_VERSION}:${crypto.createHmac("sha256", key).update(trainingExceptionPayload(e), "utf8").digest("hex")}`;
}

export function trainingExceptionSealMatches(
  e: SealableTrainingException & { hmac: string | null },
  key: string = sealKey(),
): boolean {
  if (!e.hmac) return false;
  const want = Buffer.from(trainingExceptionHmac(e, key));
  const have = Buffer.from(e.hmac);
  return want.length === have.length && crypto.timingSafeEqual(want, have);
}

/** Gives an exception about to be inserted its id, time (milliseconds, as read back) and seal. */
export function sealTrainingException<T extends Omit<SealableTrainingException, "id" | "signedAt">>(
  values: T & { id?: string; signedAt?: Date },
  key: string = sealKey(),
): T & { id: string; signedAt: Date; hmac: string } {
  const full = {
    ...values,
    id: values.id ?? crypto.randomUUID(),
    signedAt: new Date(Math.floor((values.signedAt ?? new Date()).getTime())),
  };
  return { ...full, hmac: trainingExceptionHmac(full, key) };
}
