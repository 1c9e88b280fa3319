import "server-only";
import { countedAtGate } from "./gate";
import { countVerifyLookup } from "./limit";
import { findPublicPermit, type PublicPermit } from "./queries";
import { outcomeFromProxy } from "./rendered";

// The public verification look-up behind /verify/[code]: count the look-up against the client's
// rate limit first (unless proxy.ts already did) (so unknown codes cost the same as known ones), then read the permit. Unknown and
// malformed codes give the same answer. When proxy.ts read the permit for this request already (it
// renders the page once per content, lib/verify/rendered.ts), the page shows what it read.

export type VerifyOutcome =
  { kind: "limited"; retryAfterSeconds: number } | { kind: "unknown" } | { kind: "found"; permit: PublicPermit };

export async function lookUpVerification(input: {
  code: string;
  headers: Headers;
  now?: Date;
}): Promise<VerifyOutcome> {
  const handed = outcomeFromProxy(input.headers);
  if (handed) return handed;
  if (!countedAtGate(input.headers)) {
    const limit = await countVerifyLookup(input.headers);
    if (!limit.allowed) return { kind: "limited", retryAfterSeconds: limit.retryAfterSeconds };
  }
  const permit = await findPublicPermit(input.code, input.now);
  return permit ? { kind: "found", permit } : { kind: "unknown" };
}

export { isWellFormedCode, verificationUrl } from "./code";
export { VERIFY_RATE_LIMIT, peekVerifyLookup } from "./limit";
export type { PublicPermit, PublicSigner } from "./queries";
export { countAtVerifyGate, VERIFY_HEADERS, VERIFY_PATH_PREFIX, verifyGate } from "./gate";
