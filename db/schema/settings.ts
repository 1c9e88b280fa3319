import { check, jsonb, pgTable, smallint, text, timestamp } from "drizzle-orm/pg-core";
import { sql } from "drizzle-orm";

// Institution-wide settings (one row): the name printed on permits, emergency contacts for the bench
// card, the time zone in which permit days and reminders are counted, and the prefix of permit
// numbers (PREFIX-YYYY-NNNN; lib/settings/schemas.ts has the rule the check below enforces).
export type EmergencyContact = { label: string; phone: string };

export const institutionSettings = pgTable(
  "institution_settings",
  {
    id: smallint().primaryKey().default(1),
    name: text().notNull(),
    timeZone: text().notNull().default("UTC"),
    emergencyContacts: jsonb().$type<EmergencyContact[]>().notNull().default([]),
    permitPrefix: text().notNull().default("HV"),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("institution_settings_single_row", sql`${t.id} = 1`),
    check("institution_settings_permit_prefix_format", sql`${t.permitPrefix} ~ '^[A-Z][A-Z0-9]{0,5}$'`),
  ],
);

export type InstitutionSettings = typeof institutionSettings.$inferSelect;
