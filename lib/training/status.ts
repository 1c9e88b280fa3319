// Whether a course counts through a given day: pure, browser-safe (the application page and the
// decision panel show the same words the server decides with).
//
// A completion lapses on its lapse day (completed + validity in calendar months, computed by the
// database: lib/training/queries.ts) and counts through the day before. Through the permit's last day
// means: it must not lapse on or before that day (common practice: a qualification must be in date
// for every day the work is done).

export type TrainingStatus = "current" | "lapses" | "missing";

export function trainingStatus(lapsesOn: string | null, throughDay: string): TrainingStatus {
  if (!lapsesOn) return "missing";
  return lapsesOn <= throughDay ? "lapses" : "current";
}

export type CourseCheck = {
  courseTypeId: string;
  course: string;
  minTier: number;
  /** The day the latest completion lapses (YYYY-MM-DD), or null when there is none. */
  lapsesOn: string | null;
  status: TrainingStatus;
};

export type OperatorTraining = {
  operator: string;
  userId: string | null;
  courses: CourseCheck[];
};

export type TrainingGap = {
  operator: string;
  userId: string | null;
  courseTypeId: string;
  course: string;
  status: "lapses" | "missing";
  lapsesOn: string | null;
};

/** Every lapsed or missing course of every operator, in a stable order. */
export function trainingGaps(check: readonly OperatorTraining[]): TrainingGap[] {
  const gaps: TrainingGap[] = [];
  for (const o of check) {
    for (const c of o.courses) {
      if (c.status === "current") continue;
      gaps.push({
        operator: o.operator,
        userId: o.userId,
        courseTypeId: c.courseTypeId,
        course: c.course,
        status: c.status,
        lapsesOn: c.lapsesOn,
      });
    }
  }
  return gaps;
}

/** The key an exception covers a gap by: the person (account or name) and the course. */
export function gapKey(gap: Pick<TrainingGap, "operator" | "userId" | "courseTypeId">): string {
  return `${gap.userId ?? `name:${gap.operator.trim().toLowerCase()}`}:${gap.courseTypeId}`;
}

/** The gaps no exception covers. */
export function uncoveredGaps(gaps: readonly TrainingGap[], covered: readonly TrainingGap[]): TrainingGap[] {
  const keys = new Set(covered.map(gapKey));
  return gaps.filter((g) => !keys.has(gapKey(g)));
}

/** "Capacitor-bank operator lapses on 2027-01-14" / "… not recorded". */
export function describeGap(gap: { course: string; status: TrainingStatus; lapsesOn: string | null }): string {
  return gap.status === "missing" || !gap.lapsesOn
    ? `${gap.course}: not recorded`
    : `${gap.course}: lapses on ${gap.lapsesOn}`;
}

export const STATUS_LABELS: Record<TrainingStatus | "superseded", string> = {
  current: "Current",
  lapses: "Lapsed or lapsing",
  missing: "Not recorded",
  superseded: "Replaced by a newer completion",
};
