import { bigint, index, integer, jsonb, pgTable, text, timestamp } from "drizzle-orm/pg-core";

// The mail outbox: every e-mail is a row written in the same transaction as the event that causes it.
// A worker sends queued rows and marks them sent; a failed send is retried later, never lost.
export const mailOutbox = pgTable(
  "mail_outbox",
  {
    id: bigint({ mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    kind: text().notNull(),
    toAddress: text().notNull(),
    subject: text().notNull(),
    data: jsonb().$type<Record<string, unknown>>().notNull().default({}),
    status: text({ enum: ["queued", "sent", "failed"] })
      .notNull()
      .default("queued"),
    attempts: integer().notNull().default(0),
    lastError: text(),
    // Unique per logical mail (e.g. a reminder's permit, kind and due date), so it is queued once.
    dedupeKey: text().unique(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    sentAt: timestamp({ withTimezone: true }),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("mail_outbox_status_idx").on(t.status, t.createdAt)],
);

export type OutboxMail = typeof mailOutbox.$inferSelect;
