import { sql } from "drizzle-orm";
import { check, index, integer, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { ROLES, type Role } from "../../lib/roles";

// People and the departments they belong to. Roles are an array: a person may hold several.

// The list itself is lib/roles.ts (relative import: drizzle-kit reads this file without path aliases).
export { ROLES, type Role };
export const roleEnum = pgEnum("role", ROLES);

export const departments = pgTable("department", {
  id: uuid().primaryKey().defaultRandom(),
  name: text().notNull().unique(),
  code: text().notNull().unique(),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});

export const users = pgTable(
  "app_user",
  {
    id: uuid().primaryKey().defaultRandom(),
    email: text().notNull(),
    name: text().notNull(),
    // argon2id PHC string; null until an invited user sets a password.
    passwordHash: text(),
    roles: roleEnum()
      .array()
      .notNull()
      .default(sql`'{instructor}'::role[]`),
    departmentId: uuid().references(() => departments.id, { onDelete: "restrict" }),
    // Bumped on disable, role or password change: sessions carrying an older number are refused.
    sessionVersion: integer().notNull().default(1),
    disabledAt: timestamp({ withTimezone: true }),
    lastSignInAt: timestamp({ withTimezone: true }),
    // The institution's identity provider's issuer and subject, once the person signed in through it
    // (lib/auth/sso.ts): both or neither; the pair is unique.
    oidcIssuer: text(),
    oidcSubject: text(),
    // Secret token of the user's calendar feed (permit validity windows); null until requested.
    calendarToken: text().unique(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("app_user_email_key").on(sql`lower(${t.email})`),
    index("app_user_department_idx").on(t.departmentId),
    // Search by name (lib/search; migration 0013_search_trgm).
    index("app_user_name_trgm_idx").using("gin", t.name.op("gin_trgm_ops")),
    check("app_user_roles_not_empty", sql`cardinality(${t.roles}) > 0`),
    check("app_user_oidc_pair", sql`(${t.oidcIssuer} IS NULL) = (${t.oidcSubject} IS NULL)`),
    uniqueIndex("app_user_oidc_identity_key")
      .on(t.oidcIssuer, t.oidcSubject)
      .where(sql`${t.oidcSubject} IS NOT NULL`),
  ],
);

export type Department = typeof departments.$inferSelect;
export type NewDepartment = typeof departments.$inferInsert;
export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;
