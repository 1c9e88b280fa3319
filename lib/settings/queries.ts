import "server-only";
import { sql } from "drizzle-orm";
import { cache } from "react";
import { db } from "@/db";
import { institutionSettings, type EmergencyContact } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { DEFAULT_PERMIT_PREFIX } from "./schemas";

// Reads of the institution's one settings row. Before the row exists (a fresh database without the
// demo data) the defaults apply.

export type EditableSettings = { permitPrefix: string };

export async function editableSettings(tx: DbOrTx = db): Promise<EditableSettings> {
  const [row] = await tx.select({ permitPrefix: institutionSettings.permitPrefix }).from(institutionSettings).limit(1);
  return { permitPrefix: row?.permitPrefix ?? DEFAULT_PERMIT_PREFIX };
}

/** The prefix new permit numbers take (read inside the approving transaction). */
export async function permitPrefix(tx: DbOrTx = db): Promise<string> {
  return (await editableSettings(tx)).permitPrefix;
}

// The institution's settings (one row, written by the demo data or an admin): its name, the IANA time
// zone its calendar days are counted in, and the emergency contacts printed on permits. Everything
// that needs them reads them here. A missing row reads as no name, UTC and no contacts; each caller
// words the missing name its own way (mail says "your institution", the PDF prints the product name).

export type InstitutionSettings = {
  name: string | null;
  timeZone: string;
  emergencyContacts: EmergencyContact[];
};

// Read once per page render: the dashboard's sections each asked for the time zone (seven identical
// reads per request, docs/performance.md). React's cache() keeps a value for one server render only
// and passes through everywhere else (route handlers, jobs, tests), so a change is seen by the next
// request; a read inside a transaction is never shared.
const readOncePerRender = cache(() => readSettingsRow(db));

export async function readInstitutionSettings(tx: DbOrTx = db): Promise<InstitutionSettings> {
  return tx === db ? readOncePerRender() : readSettingsRow(tx);
}

async function readSettingsRow(tx: DbOrTx): Promise<InstitutionSettings> {
  const [row] = await tx
    .select({
      name: institutionSettings.name,
      timeZone: institutionSettings.timeZone,
      emergencyContacts: institutionSettings.emergencyContacts,
    })
    .from(institutionSettings)
    .limit(1);
  return {
    name: row?.name || null,
    timeZone: row?.timeZone || DEFAULT_TIME_ZONE,
    emergencyContacts: row?.emergencyContacts ?? [],
  };
}

/** The calendar's zone when no settings row exists. */
export const DEFAULT_TIME_ZONE = "UTC";

/**
 * The institution's time zone as a scalar subquery, for a read that wants it in the same round trip
 * (the public status page); null before the row exists (read it as DEFAULT_TIME_ZONE).
 */
export const institutionTimeZoneSql = sql<
  string | null
>`(SELECT ${institutionSettings.timeZone} FROM ${institutionSettings} LIMIT 1)`;

export async function institutionTimeZone(tx: DbOrTx = db): Promise<string> {
  return (await readInstitutionSettings(tx)).timeZone;
}
