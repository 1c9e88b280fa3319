import "server-only";
import crypto from "node:crypto";
import { and, desc, eq, isNull, or, sql } from "drizzle-orm";
import { db } from "@/db";
import { applicationRevisions, applications, permits, users } from "@/db/schema";
import { env } from "@/lib/env";
import { senderDomain } from "@/lib/outbox/headers";
import { readInstitutionSettings } from "@/lib/settings/queries";
import { effectivePermitState, todayIn } from "@/lib/permits/dates";
import { buildCalendar, permitEvents } from "./ics";

// The per-user calendar feed: the permits a person holds or is named on, as all-day events. The
// feed URL carries a secret token (≥ 256 bits); only its SHA-256 is stored (users.calendar_token),
// so a copy of the database does not reveal working feed URLs.

export const CALENDAR_TOKEN = /^[A-Za-z0-9_-]{43}$/;
const FEED_LIMIT = 500;

export function hashCalendarToken(token: string): string {
  return crypto.createHash("sha256").update(token).digest("hex");
}

export async function hasCalendarFeed(userId: string): Promise<boolean> {
  const [row] = await db.select({ token: users.calendarToken }).from(users).where(eq(users.id, userId)).limit(1);
  return Boolean(row?.token);
}

/** The feed's iCalendar text for a token, or null when no active user has that token. */
export async function calendarFeed(token: string, now = new Date()): Promise<string | null> {
  if (!CALENDAR_TOKEN.test(token)) return null;
  const [user] = await db
    .select({ id: users.id, name: users.name })
    .from(users)
    .where(and(eq(users.calendarToken, hashCalendarToken(token)), isNull(users.disabledAt)))
    .limit(1);
  if (!user) return null;
  const { timeZone } = await readInstitutionSettings();
  const today = todayIn(timeZone, now);
  const rows = await db
    .select({
      id: permits.id,
      number: permits.number,
      state: permits.state,
      validFrom: permits.validFrom,
      validTo: permits.validTo,
      updatedAt: permits.updatedAt,
      version: permits.version,
      title: applications.title,
      room: sql<string | null>`${applicationRevisions.content} -> 'event' ->> 'room'`,
    })
    .from(permits)
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
    .where(or(eq(permits.holderId, user.id), sql`${user.id}::uuid = ANY(${applications.namedUserIds})`))
    .orderBy(desc(permits.validTo))
    .limit(FEED_LIMIT);
  const config = env();
  const domain = senderDomain(config.MAIL_FROM);
  return buildCalendar({
    name: `Benchclear permits: ${user.name}`,
    events: rows.flatMap((p) =>
      permitEvents({ ...p, state: effectivePermitState(p, today) }, { appUrl: config.APP_URL, domain }),
    ),
  });
}
