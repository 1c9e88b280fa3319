import "server-only";
import { and, eq, gte, lte, sql } from "drizzle-orm";
import { db } from "@/db";
import { departments, permits, users, applications, applicationRevisions } from "@/db/schema";
import type { EmergencyContact } from "@/db/schema";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import type { DbOrTx } from "@/lib/audit";
import { readInstitutionSettings } from "@/lib/settings/queries";
import { joinPermitBase } from "./base-query";
import { todayIn } from "./dates";
import { splitPlace, walkOrder, type Place } from "./places";

// Where high voltage is live today: every permit that is active on the institution's calendar day
// (stored state active, today within its signed validity window, which the approver set from the
// event days), with where it stands, its tier, its holder and the number to call. For the safety
// office and for emergency responders ("live.read"); read by /live and its one-page PDF.

export type LiveRow = Place & {
  permitId: string;
  number: string;
  tier: number;
  title: string;
  apparatusName: string;
  holderName: string;
  departmentName: string;
  validFrom: string;
  validTo: string;
  /** The institution's first emergency contact (the one to call first), or null when none is set. */
  emergencyPhone: string | null;
};

export type LiveSheet = {
  institutionName: string | null;
  timeZone: string;
  /** The institution's calendar day the sheet is for (YYYY-MM-DD). */
  today: string;
  /** When the sheet was read (ISO, UTC). */
  readAt: string;
  contacts: EmergencyContact[];
  rows: LiveRow[];
};

export async function liveSheet(user: CurrentUser, now: Date = new Date(), tx: DbOrTx = db): Promise<LiveSheet> {
  assertCan(user, "live.read");
  const settings = await readInstitutionSettings(tx);
  const today = todayIn(settings.timeZone, now);
  const found = await joinPermitBase(
    tx
      .select({
        permitId: permits.id,
        number: permits.number,
        tier: permits.tier,
        validFrom: permits.validFrom,
        validTo: permits.validTo,
        title: applications.title,
        place: sql<
          string | null
        >`coalesce(nullif(${applicationRevisions.content}->'event'->>'room', ''), ${applicationRevisions.content}->'apparatus'->>'room')`,
        apparatusName: sql<string | null>`${applicationRevisions.content}->'apparatus'->>'name'`,
        holderName: users.name,
        departmentName: departments.name,
      })
      .from(permits)
      .$dynamic(),
  )
    .innerJoin(departments, eq(departments.id, applications.departmentId))
    .where(and(eq(permits.state, "active"), lte(permits.validFrom, today), gte(permits.validTo, today)));
  const emergencyPhone = settings.emergencyContacts[0]?.phone ?? null;
  const rows = found
    .map(({ place, apparatusName, ...row }) => ({
      ...row,
      ...splitPlace(place ?? ""),
      apparatusName: apparatusName ?? "",
      emergencyPhone,
    }))
    .sort(walkOrder);
  return {
    institutionName: settings.name,
    timeZone: settings.timeZone,
    today,
    readAt: now.toISOString(),
    contacts: settings.emergencyContacts,
    rows,
  };
}
