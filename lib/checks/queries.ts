import "server-only";
import { and, asc, desc, eq, gte, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import {
  applicationRevisions,
  applications,
  permits,
  preUseCheckPhotos,
  preUseChecks,
  users,
  type PermitState,
  type PreUseCheckItem,
} from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { can, type CurrentUser } from "@/lib/auth/guards";
import { requiredControls, type Assessment } from "@/lib/hazard";
import { joinPermitBase } from "@/lib/permits/base-query";
import { effectivePermitState } from "@/lib/permits/dates";
import { institutionToday, permitScope } from "@/lib/permits/queries";
import { buildChecklist, type ChecklistItem } from "./checklist";

// Reads of pre-use checks. A permit's checks are seen by whoever may see the permit (lib/permits
// permitScope); who may record one is decided here too (mayRecordCheck), so the page, the route and
// the log agree.

type Loose = Record<string, unknown>;
const obj = (value: unknown): Loose =>
  value && typeof value === "object" && !Array.isArray(value) ? (value as Loose) : {};
const str = (value: unknown): string => (typeof value === "string" ? value : "");

export type CheckTarget = {
  permit: {
    id: string;
    number: string;
    tier: number;
    validFrom: string;
    validTo: string;
    holderId: string;
    holderName: string;
    title: string;
    room: string;
    apparatusName: string;
  };
  namedUserIds: string[];
  effectiveState: PermitState;
  /** Active, and today is inside its window: a check may be recorded now. */
  inUse: boolean;
  today: string;
  checklist: ChecklistItem[];
};

/** The permit a check is about, with its checklist; null when missing or not visible to this user. */
export async function checkTarget(
  user: CurrentUser,
  permitId: string,
  now = new Date(),
  tx: DbOrTx = db,
): Promise<CheckTarget | null> {
  const [row] = await joinPermitBase(
    tx
      .select({
        id: permits.id,
        number: permits.number,
        tier: permits.tier,
        state: permits.state,
        validFrom: permits.validFrom,
        validTo: permits.validTo,
        conditions: permits.conditions,
        holderId: permits.holderId,
        holderName: users.name,
        namedUserIds: applications.namedUserIds,
        title: applications.title,
        content: applicationRevisions.content,
        assessment: applicationRevisions.assessment,
      })
      .from(permits)
      .$dynamic(),
  )
    .where(and(eq(permits.id, permitId), permitScope(user)))
    .limit(1);
  if (!row) return null;
  const today = await institutionToday(now, tx);
  const effectiveState = effectivePermitState(row, today);
  const content = obj(row.content);
  const event = obj(content.event);
  const apparatus = obj(content.apparatus);
  const assessment = row.assessment as Assessment;
  const confirmed = Array.isArray(obj(content.controls).required)
    ? (obj(content.controls).required as unknown[]).map((c) => ({ code: str(obj(c).code), text: str(obj(c).text) }))
    : [];
  // A revision frozen without its controls still gets the tier's list from the default tier rules.
  const controls = confirmed.length ? confirmed : requiredControls(row.tier).map((c) => ({ code: c.id, text: c.text }));
  return {
    permit: {
      id: row.id,
      number: row.number,
      tier: row.tier,
      validFrom: row.validFrom,
      validTo: row.validTo,
      holderId: row.holderId,
      holderName: row.holderName,
      title: row.title,
      room: str(event.room) || str(apparatus.room),
      apparatusName: str(apparatus.name),
    },
    namedUserIds: row.namedUserIds,
    effectiveState,
    inUse: effectiveState === "active" && row.validFrom <= today,
    today,
    checklist: buildChecklist({
      tier: row.tier,
      controls,
      conditions: row.conditions,
      limitedApproach_m: assessment.approach?.limited_m ?? null,
    }),
  };
}

/**
 * Who may record a check on a permit they can see: its holder and the people named on its
 * application (operators, the responsible person), and safety officers on any permit.
 */
export function mayRecordCheck(user: CurrentUser, target: Pick<CheckTarget, "permit" | "namedUserIds">): boolean {
  if (!can(user, "permit.check")) return false;
  if (can(user, "permit.check.any")) return true;
  return target.permit.holderId === user.id || target.namedUserIds.includes(user.id);
}

export type CheckLogEntry = {
  id: string;
  recordedByName: string;
  checkedAt: Date;
  anyNo: boolean;
  note: string;
  items: PreUseCheckItem[];
};

/** The checks of a permit this user may see, newest first (at most `limit`). */
export async function checkLog(user: CurrentUser, permitId: string, limit = 50): Promise<CheckLogEntry[]> {
  const [visible] = await db
    .select({ id: permits.id })
    .from(permits)
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .where(and(eq(permits.id, permitId), permitScope(user)))
    .limit(1);
  if (!visible) return [];
  return db
    .select({
      id: preUseChecks.id,
      recordedByName: preUseChecks.recordedByName,
      checkedAt: preUseChecks.checkedAt,
      anyNo: preUseChecks.anyNo,
      note: preUseChecks.note,
      items: preUseChecks.items,
    })
    .from(preUseChecks)
    .where(eq(preUseChecks.permitId, permitId))
    .orderBy(desc(preUseChecks.checkedAt))
    .limit(limit);
}

/** How far back a tier 3–4 permit in use must have a check before the officers' dashboard lists it. */
export const CHECK_DUE_DAYS = 7;
export const CHECK_DUE_FROM_TIER = 3;

export type CheckDueRow = {
  id: string;
  number: string;
  tier: number;
  title: string;
  validFrom: string;
  validTo: string;
  lastCheckedAt: Date | null;
};

/**
 * For safety officers: active tier 3–4 permits in use today with no check in the last 7 days
 * (7 × 24 h; a permit in use for fewer days counts from its first day, since no check can be older).
 */
export async function permitsDueACheck(user: CurrentUser, now = new Date(), limit = 20): Promise<CheckDueRow[]> {
  if (!can(user, "permit.check.any")) return [];
  const today = await institutionToday(now);
  const since = new Date(now.getTime() - CHECK_DUE_DAYS * 86_400_000);
  const last = sql<Date | null>`(SELECT max(${preUseChecks.checkedAt}) FROM ${preUseChecks} WHERE ${preUseChecks.permitId} = ${permits.id})`;
  // The title as a subquery, which PostgreSQL evaluates after the sort and limit: a join read the
  // application of every permit due (3,507 at 100k permits, 14,028 buffers) for the 20 shown.
  const title = sql<string>`(SELECT ${applications.title} FROM ${applications} WHERE ${applications.id} = ${permits.applicationId})`;
  const rows = await db
    .select({
      id: permits.id,
      number: permits.number,
      tier: permits.tier,
      title,
      validFrom: permits.validFrom,
      validTo: permits.validTo,
      lastCheckedAt: last,
    })
    .from(permits)
    .where(
      and(
        gte(permits.tier, CHECK_DUE_FROM_TIER),
        eq(permits.state, "active"),
        sql`${permits.validFrom} <= ${today}::date`,
        sql`${permits.validTo} >= ${today}::date`,
        sql`NOT EXISTS (SELECT 1 FROM ${preUseChecks} WHERE ${preUseChecks.permitId} = ${permits.id} AND ${preUseChecks.checkedAt} >= ${since.toISOString()}::timestamptz)`,
      ),
    )
    .orderBy(sql`${last} ASC NULLS FIRST`, asc(permits.validTo))
    .limit(limit);
  return rows.map((r) => ({ ...r, lastCheckedAt: r.lastCheckedAt ? new Date(r.lastCheckedAt) : null }));
}

/** A check photo this user may see (through the permit), or null. */
export async function checkPhotoFor(user: CurrentUser, permitId: string, photoId: string) {
  const [row] = await db
    .select({
      storageKey: preUseCheckPhotos.storageKey,
      contentType: preUseCheckPhotos.contentType,
      size_B: preUseCheckPhotos.size_B,
    })
    .from(preUseCheckPhotos)
    .innerJoin(permits, eq(permits.id, preUseCheckPhotos.permitId))
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .where(and(eq(preUseCheckPhotos.id, photoId), eq(preUseCheckPhotos.permitId, permitId), permitScope(user)))
    .limit(1);
  return row ?? null;
}

/** The ids among `ids` that are photos of this permit. */
export async function photosOfPermit(tx: DbOrTx, permitId: string, ids: readonly string[]): Promise<Set<string>> {
  if (ids.length === 0) return new Set();
  const rows = await tx
    .select({ id: preUseCheckPhotos.id })
    .from(preUseCheckPhotos)
    .where(and(eq(preUseCheckPhotos.permitId, permitId), inArray(preUseCheckPhotos.id, [...ids])));
  return new Set(rows.map((r) => r.id));
}
