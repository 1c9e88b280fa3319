// Separation of duties (security.md 4.3.3), the rule every signature obeys: nobody signs a decision
// on an application they submitted or are named on, and one person signs one step of a chain. The
// review chain (lib/review) and permit revocation (lib/permits/revoke.ts) both ask it.

import type { Role } from "@/db/schema";

export type PolicyActor = { id: string; roles: readonly Role[]; departmentId: string | null };

/** Why a signature is refused: 403 for "not you", 409 for "not now". */
export type Refusal = { status: 403 | 409; message: string };

/** Separation of duties (security.md 4.3.3): the refusal, or null when the actor may sign. */
export function separationOfDuties(input: {
  actor: PolicyActor;
  application: { applicantId: string; namedUserIds: readonly string[] };
  submittedById: string | null;
  signerIds: readonly string[];
}): Refusal | null {
  const { actor, application } = input;
  if (actor.id === application.applicantId || actor.id === input.submittedById) {
    return { status: 403, message: "You submitted this application: someone else must decide on it." };
  }
  if (application.namedUserIds.includes(actor.id)) {
    return { status: 403, message: "You are named on this application, so you may not decide on it." };
  }
  if (input.signerIds.includes(actor.id)) {
    return {
      status: 403,
      message: "You already signed a step of this review chain; another person signs the next one.",
    };
  }
  return null;
}
