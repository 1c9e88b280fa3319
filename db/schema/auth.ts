import { bigint, index, pgTable, text, timestamp, uuid, boolean } from "drizzle-orm/pg-core";
import { roleEnum, departments, users } from "./users";

// Invitations: an admin invites by e-mail; the invited person sets their own password through a
// single-use link. Only the SHA-256 of the link's token is stored.
export const invitations = pgTable(
  "invitation",
  {
    id: uuid().primaryKey().defaultRandom(),
    tokenHash: text().notNull().unique(),
    email: text().notNull(),
    name: text().notNull(),
    roles: roleEnum().array().notNull(),
    departmentId: uuid().references(() => departments.id, { onDelete: "restrict" }),
    invitedById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    usedAt: timestamp({ withTimezone: true }),
    revokedAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("invitation_email_idx").on(t.email)],
);

// Sign-in attempts, for throttling per e-mail and per client address. Old rows are pruned.
export const signInAttempts = pgTable(
  "sign_in_attempt",
  {
    id: bigint({ mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    email: text().notNull(),
    ip: text().notNull(),
    succeeded: boolean().notNull(),
    attemptedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("sign_in_attempt_email_idx").on(t.email, t.attemptedAt),
    index("sign_in_attempt_ip_idx").on(t.ip, t.attemptedAt),
  ],
);

export type Invitation = typeof invitations.$inferSelect;
