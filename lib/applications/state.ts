import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import { applications, type Application, type ApplicationState } from "@/db/schema";
import type { Tx } from "@/lib/audit";
import { conflict } from "@/lib/errors";

// The application state machine. Every state change goes through transition(), inside the caller's
// transaction (which also writes the audit row and any outbox row). The UPDATE is guarded in SQL by
// the expected state(s) and version, so of two concurrent changes exactly one wins; the other gets
// 409 Conflict.
//
//   draft ──submit──▶ submitted ──recommend──▶ in_review ──approve──▶ approved (permit active)
//     │                  │  └──approve (tier 0 self-certified, tier 1)──▶ approved
//     │                  ├──return──▶ returned ──resubmit──▶ submitted
//     │                  └──reject──▶ rejected        in_review ──return / reject──▶ …
//     └──withdraw (from draft, submitted, in_review, returned)──▶ withdrawn

export const TRANSITIONS: Record<ApplicationState, readonly ApplicationState[]> = {
  draft: ["submitted", "withdrawn"],
  submitted: ["in_review", "approved", "returned", "rejected", "withdrawn"],
  in_review: ["in_review", "approved", "returned", "rejected", "withdrawn"],
  returned: ["submitted", "withdrawn"],
  approved: [],
  rejected: [],
  withdrawn: [],
};

export function canTransition(from: ApplicationState, to: ApplicationState): boolean {
  return TRANSITIONS[from].includes(to);
}

type TransitionInput = {
  applicationId: string;
  from: readonly ApplicationState[];
  to: ApplicationState;
  expectedVersion: number;
  /** Other columns to set in the same UPDATE (never state or version). */
  set?: Partial<Omit<typeof applications.$inferInsert, "state" | "version" | "id">>;
};

export async function transition(tx: Tx, input: TransitionInput): Promise<Application> {
  for (const from of input.from) {
    if (!canTransition(from, input.to)) throw new Error(`transition ${from} → ${input.to} is not allowed`);
  }
  const [row] = await tx
    .update(applications)
    .set({ ...input.set, state: input.to, version: sql`${applications.version} + 1`, updatedAt: new Date() })
    .where(
      and(
        eq(applications.id, input.applicationId),
        inArray(applications.state, [...input.from]),
        eq(applications.version, input.expectedVersion),
      ),
    )
    .returning();
  if (!row) {
    throw conflict("This application changed while you were working on it. Reload it and try again.");
  }
  return row;
}
