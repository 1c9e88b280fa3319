import "server-only";
import { and, asc, eq, gt, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { applicationRevisions, applications, departments, permits, users } from "@/db/schema";
import { assertCan, can, type CurrentUser } from "@/lib/auth/guards";
import { assessSetup, upgradeSetup, type SetupInput, type TierRules } from "@/lib/hazard";
import type { RulesPreview, TierMove } from "./preview-types";
import { currentTierRuleSet } from "./queries";

export type { RulesPreview, TierMove };

// What adopting new tier thresholds would change, before anything is adopted: every open application
// (submitted, in review, returned) and every active permit is assessed again with the engine on the
// set-up its current revision stores, once under the thresholds in force and once under the proposed
// ones; a record is listed when the two tiers differ. Comparing with the rules in force (not with the
// tier stored at submission) keeps the list to what this change does: a record assessed under older
// thresholds would otherwise show up whatever is proposed. Its recorded tier is returned beside them.
// Nothing here writes: the stored assessments, permits and tiers never change after the fact.
// Drafts are left out: they are assessed again when they are submitted.

const OPEN_STATES = ["submitted", "in_review", "returned"] as const;

/** Rows read per query: 500 set-ups of a few kB each keep one batch well under 10 MB. */
const BATCH = 500;

type Candidate = {
  id: string;
  reference: string;
  title: string;
  departmentName: string;
  recordedTier: number;
  setup: unknown;
};

function tierOf(setup: unknown, rules: TierRules): number | null {
  try {
    return assessSetup(upgradeSetup(setup as SetupInput).setup, rules).tier;
  } catch {
    // A set-up the engine refuses today (stored before a check was added) is counted, not listed.
    return null;
  }
}

async function* openApplications(): AsyncGenerator<Candidate[]> {
  let after = "00000000-0000-0000-0000-000000000000";
  for (;;) {
    const rows = await db
      .select({
        id: applications.id,
        seq: applications.seq,
        title: applications.title,
        departmentName: departments.name,
        recordedTier: applicationRevisions.tier,
        setup: sql<unknown>`${applicationRevisions.content} -> 'apparatus' -> 'setup'`,
      })
      .from(applications)
      .innerJoin(applicationRevisions, eq(applicationRevisions.id, applications.currentRevisionId))
      .innerJoin(departments, eq(departments.id, applications.departmentId))
      .where(and(inArray(applications.state, [...OPEN_STATES]), gt(applications.id, after)))
      .orderBy(asc(applications.id))
      .limit(BATCH);
    if (rows.length === 0) return;
    yield rows.map((r) => ({ ...r, reference: `A-${r.seq}` }));
    if (rows.length < BATCH) return;
    after = rows[rows.length - 1].id;
  }
}

async function* activePermits(today: string): AsyncGenerator<Candidate[]> {
  let after = "00000000-0000-0000-0000-000000000000";
  for (;;) {
    const rows = await db
      .select({
        id: permits.id,
        reference: permits.number,
        title: applications.title,
        holderName: users.name,
        departmentName: departments.name,
        recordedTier: permits.tier,
        setup: sql<unknown>`${applicationRevisions.content} -> 'apparatus' -> 'setup'`,
      })
      .from(permits)
      .innerJoin(applications, eq(applications.id, permits.applicationId))
      .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
      .innerJoin(users, eq(users.id, permits.holderId))
      .innerJoin(departments, eq(departments.id, applications.departmentId))
      // Active as lib/permits reads it: not revoked, and its last day not yet past in the institution's calendar.
      .where(and(eq(permits.state, "active"), sql`${permits.validTo} >= ${today}::date`, gt(permits.id, after)))
      .orderBy(asc(permits.id))
      .limit(BATCH);
    if (rows.length === 0) return;
    yield rows.map((r) => ({ ...r, title: `${r.title} · ${r.holderName}` }));
    if (rows.length < BATCH) return;
    after = rows[rows.length - 1].id;
  }
}

/**
 * The open applications and active permits whose tier `proposed` would change. `today` is the
 * institution's calendar day (YYYY-MM-DD), which decides which permits are still active.
 */
export async function previewTierRules(viewer: CurrentUser, proposed: TierRules, today: string): Promise<RulesPreview> {
  assertCan(viewer, "admin.rules");
  const now = (await currentTierRuleSet()).rules;
  // Titles and holders are shown only to those who may read every application and permit; an admin
  // without that sees each record's reference, department and tiers.
  const showApplicationTitles = can(viewer, "application.read.any");
  const showPermitTitles = can(viewer, "permit.read.any");
  let unreadable = 0;
  // Many records share a set-up (permits renewed, one apparatus on many applications): each distinct
  // set-up is assessed once. One assessment took about 0.75 ms on the 2-core development machine under
  // load, so at thousands of active permits this is what keeps the preview short.
  const tiers = new Map<string, readonly [number | null, number | null]>();
  const tiersOf = (setup: unknown) => {
    const key = JSON.stringify(setup);
    let found = tiers.get(key);
    if (!found) {
      found = [tierOf(setup, now), tierOf(setup, proposed)] as const;
      tiers.set(key, found);
    }
    return found;
  };

  async function moves(batches: AsyncGenerator<Candidate[]>, showTitles: boolean) {
    const out: TierMove[] = [];
    let checked = 0;
    for await (const batch of batches) {
      for (const row of batch) {
        checked++;
        const [tierNow, tierNew] = tiersOf(row.setup);
        if (tierNow === null || tierNew === null) {
          unreadable++;
          continue;
        }
        if (tierNow === tierNew) continue;
        out.push({
          id: row.id,
          reference: row.reference,
          title: showTitles ? row.title : null,
          departmentName: row.departmentName,
          recordedTier: row.recordedTier,
          tierNow,
          tierNew,
        });
      }
    }
    out.sort((a, b) => b.tierNew - b.tierNow - (a.tierNew - a.tierNow) || a.reference.localeCompare(b.reference));
    return { out, checked };
  }

  const apps = await moves(openApplications(), showApplicationTitles);
  const held = await moves(activePermits(today), showPermitTitles);
  return {
    rulesVersionNow: now.rulesVersion,
    rulesVersionNew: proposed.rulesVersion,
    applications: apps.out,
    permits: held.out,
    checked: { applications: apps.checked, permits: held.checked, unreadable },
  };
}
