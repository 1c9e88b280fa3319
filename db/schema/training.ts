import { sql } from "drizzle-orm";
import {
  check,
  date,
  index,
  integer,
  jsonb,
  pgTable,
  smallint,
  text,
  timestamp,
  unique,
  uuid,
} from "drizzle-orm/pg-core";
import { applicationRevisions, applications } from "./applications";
import { departments, users } from "./users";

// Training records (issue 17): the course types admins define, the courses people completed, and the
// signed exceptions an approver records when a named operator's training is lapsed or missing.

export const courseTypes = pgTable(
  "course_type",
  {
    id: uuid().primaryKey().defaultRandom(),
    name: text().notNull(),
    // What the course covers, shown beside the name.
    covers: text().notNull().default(""),
    // A completion is valid for this many calendar months (1–240).
    validityMonths: smallint().notNull(),
    // Required of every named operator from this tier up (1–4).
    minTier: smallint().notNull(),
    // Required in one department only; null = in every department.
    departmentId: uuid().references(() => departments.id, { onDelete: "restrict" }),
    // Retired types are no longer required nor offered; their records stay.
    retiredAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique("course_type_name_key").on(t.name),
    check("course_type_validity_range", sql`${t.validityMonths} BETWEEN 1 AND 240`),
    check("course_type_tier_range", sql`${t.minTier} BETWEEN 1 AND 4`),
  ],
);

export const trainingRecords = pgTable(
  "training_record",
  {
    id: uuid().primaryKey().defaultRandom(),
    userId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    courseTypeId: uuid()
      .notNull()
      .references(() => courseTypes.id, { onDelete: "restrict" }),
    // The day the course was completed (institution calendar day).
    completedOn: date({ mode: "string" }).notNull(),
    trainer: text().notNull(),
    // The certificate, stored through lib/storage (type read from the bytes, same limits as uploads).
    certificateKey: text(),
    certificateFilename: text(),
    certificateContentType: text(),
    certificateSize_B: integer("certificate_size_b"),
    certificateSha256: text(),
    recordedById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    // Withdrawn (entered in error): kept for the record, no longer counted.
    removedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index("training_record_user_course_idx").on(t.userId, t.courseTypeId, t.completedOn)],
);

/** One operator's lapsed or missing course, as an exception records it (and its seal covers it). */
export type TrainingGapRecord = {
  operator: string;
  userId: string | null;
  courseTypeId: string;
  course: string;
  status: "lapses" | "missing";
  /** The day the latest completion lapses (YYYY-MM-DD), null when there is none. */
  lapsesOn: string | null;
};

export const trainingExceptions = pgTable(
  "training_exception",
  {
    id: uuid().primaryKey().defaultRandom(),
    applicationId: uuid()
      .notNull()
      .references(() => applications.id, { onDelete: "restrict" }),
    revisionId: uuid()
      .notNull()
      .references(() => applicationRevisions.id, { onDelete: "restrict" }),
    // The last day the training was checked through (the permit's last day as proposed).
    throughDay: date({ mode: "string" }).notNull(),
    gaps: jsonb().$type<TrainingGapRecord[]>().notNull(),
    reason: text().notNull(),
    signerId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    signerName: text().notNull(),
    signerRole: text().notNull(),
    meaning: text().notNull(),
    // SHA-256 of the revision's canonical content, as a decision on it signs.
    contentHash: text().notNull(),
    signedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    // HMAC with DECISION_HMAC_KEY over all of the above (lib/records/training-seal.ts).
    hmac: text().notNull(),
  },
  (t) => [index("training_exception_revision_idx").on(t.revisionId)],
);

export type CourseType = typeof courseTypes.$inferSelect;
export type TrainingRecord = typeof trainingRecords.$inferSelect;
export type TrainingException = typeof trainingExceptions.$inferSelect;
