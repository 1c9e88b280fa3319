import "server-only";
import { sql, type SQL } from "drizzle-orm";
import { db } from "@/db";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { todayIn } from "@/lib/permits/dates";
import { readInstitutionSettings } from "@/lib/settings/queries";
import { addDaysIso, defaultRange, monthsBetween } from "./range";
import type { ReportFilterInput } from "./schemas";

// The safety committee's report (/reports): what a committee asks each term, over a range of
// institution calendar days and optionally one department. Every figure is counted in the
// institution's time zone. For safety officers and admins ("report.read").
//
//   issued       permits issued per month, by tier (issue time within the range)
//   decisions    hours from a revision's submission to the decision that ended its wait (approve,
//                reject or return; a reviewer's recommendation is a step, not an end), median and
//                90th percentile (PostgreSQL percentile_cont: linear between ranks) per tier, for
//                decisions signed within the range. Tier 0 is self-certified: no decision, no wait.
//   returns      per application first submitted within the range, how often it came back
//   active       permits active today (not revoked, not past their last day) by department and tier
//   expiries     permits active today whose last valid day is within the next 90 days (today and
//                the 89 after), by week, and each of them
//   incidents    incident and near-miss reports by the month they happened (occurred_at, not the day
//                they were reported), with how many hurt someone. An incident's department is that of
//                the permit it names, else of the apparatus it names, else of its reporter.

export const EXPIRY_WINDOW_DAYS = 90;

export type ReportFilters = {
  from: string;
  to: string;
  departmentId: string | null;
  today: string;
  timeZone: string;
  institutionName: string | null;
};

export type TierCounts = { 0: number; 1: number; 2: number; 3: number; 4: number };
const zeroTiers = (): TierCounts => ({ 0: 0, 1: 0, 2: 0, 3: 0, 4: 0 });

export type Report = {
  filters: ReportFilters;
  departmentName: string | null;
  issued: { month: string; tiers: TierCounts; total: number }[];
  decisionTimes: { tier: number; decisions: number; medianHours: number | null; p90Hours: number | null }[];
  returns: {
    tier: number;
    applications: number;
    returns: number;
    /** Applications that came back 0, 1, 2 and 3 or more times. */
    buckets: [number, number, number, number];
  }[];
  active: { department: string; tiers: TierCounts; total: number }[];
  expiriesByWeek: { weekStart: string; tiers: TierCounts; total: number }[];
  expiries: { number: string; tier: number; department: string; holder: string; validTo: string; daysLeft: number }[];
  incidents: { month: string; incidents: number; nearMisses: number; injuries: number; total: number }[];
};

/** Resolves the filters against the institution's calendar (default: the last twelve months). */
export async function reportFilters(input: ReportFilterInput, now = new Date()): Promise<ReportFilters> {
  const { timeZone, name } = await readInstitutionSettings();
  const today = todayIn(timeZone, now);
  const range = defaultRange(today);
  return {
    from: input.from ?? (input.to && input.to < range.from ? input.to : range.from),
    to: input.to ?? (input.from && input.from > today ? input.from : today),
    departmentId: input.department ?? null,
    today,
    timeZone,
    institutionName: name,
  };
}

function inDepartment(column: SQL, departmentId: string | null): SQL {
  return departmentId ? sql`${column} = ${departmentId}::uuid` : sql`true`;
}

/** A timestamp's institution calendar day, as SQL. */
const localDay = (column: SQL, timeZone: string) => sql`(${column} AT TIME ZONE ${timeZone})::date`;

export async function committeeReport(user: CurrentUser, filters: ReportFilters): Promise<Report> {
  assertCan(user, "report.read");
  const { from, to, departmentId, today, timeZone } = filters;
  const dept = (column: SQL) => inDepartment(column, departmentId);

  const [departmentRow] = departmentId
    ? (await db.execute<{ name: string }>(sql`SELECT name FROM department WHERE id = ${departmentId}::uuid`)).rows
    : [];

  const issuedRows = (
    await db.execute<{ month: string; tier: number; n: number }>(sql`
      SELECT to_char(p.issued_at AT TIME ZONE ${timeZone}, 'YYYY-MM') AS month, p.tier, count(*)::int AS n
      FROM permit p JOIN application a ON a.id = p.application_id
      WHERE ${localDay(sql`p.issued_at`, timeZone)} BETWEEN ${from}::date AND ${to}::date
        AND ${dept(sql`a.department_id`)}
      GROUP BY 1, 2`)
  ).rows;
  const issued = monthsBetween(from, to).map((month) => {
    const tiers = zeroTiers();
    for (const r of issuedRows) if (r.month === month) tiers[r.tier as keyof TierCounts] += r.n;
    return { month, tiers, total: Object.values(tiers).reduce((a, b) => a + b, 0) };
  });

  const decisionTimes = (
    await db.execute<{ tier: number; decisions: number; median: number | null; p90: number | null }>(sql`
      SELECT w.tier, count(*)::int AS decisions,
        percentile_cont(0.5) WITHIN GROUP (ORDER BY w.hours) AS median,
        percentile_cont(0.9) WITHIN GROUP (ORDER BY w.hours) AS p90
      FROM (
        SELECT r.tier, extract(epoch FROM (d.signed_at - r.submitted_at)) / 3600.0 AS hours
        FROM application_revision r
        JOIN application a ON a.id = r.application_id
        JOIN LATERAL (
          SELECT signed_at FROM decision
          WHERE revision_id = r.id AND kind IN ('approve', 'reject', 'return')
          ORDER BY signed_at LIMIT 1
        ) d ON true
        WHERE ${localDay(sql`d.signed_at`, timeZone)} BETWEEN ${from}::date AND ${to}::date
          AND ${dept(sql`a.department_id`)}
      ) w
      GROUP BY w.tier ORDER BY w.tier`)
  ).rows.map((r) => ({
    tier: r.tier,
    decisions: r.decisions,
    medianHours: r.median === null ? null : Number(r.median),
    p90Hours: r.p90 === null ? null : Number(r.p90),
  }));

  const returns = (
    await db.execute<{
      tier: number;
      applications: number;
      returns: number;
      b0: number;
      b1: number;
      b2: number;
      b3: number;
    }>(sql`
      SELECT x.tier, count(*)::int AS applications, coalesce(sum(x.returns), 0)::int AS returns,
        count(*) FILTER (WHERE x.returns = 0)::int AS b0, count(*) FILTER (WHERE x.returns = 1)::int AS b1,
        count(*) FILTER (WHERE x.returns = 2)::int AS b2, count(*) FILTER (WHERE x.returns >= 3)::int AS b3
      FROM (
        SELECT a.id, coalesce(a.tier, 0) AS tier,
          (SELECT count(*) FROM decision d WHERE d.application_id = a.id AND d.kind = 'return') AS returns
        FROM application a
        WHERE ${dept(sql`a.department_id`)}
          AND ${localDay(sql`(SELECT min(r.submitted_at) FROM application_revision r WHERE r.application_id = a.id)`, timeZone)}
            BETWEEN ${from}::date AND ${to}::date
      ) x
      GROUP BY x.tier ORDER BY x.tier`)
  ).rows.map((r) => ({
    tier: r.tier,
    applications: r.applications,
    returns: r.returns,
    buckets: [r.b0, r.b1, r.b2, r.b3] as [number, number, number, number],
  }));

  // Active as the permit list counts it (lib/permits/queries.ts effectiveStateSql), as of today.
  const activeSql = sql`p.state = 'active' AND p.valid_to >= ${today}::date`;
  const activeRows = (
    await db.execute<{ department: string; tier: number; n: number }>(sql`
      SELECT dp.name AS department, p.tier, count(*)::int AS n
      FROM permit p JOIN application a ON a.id = p.application_id JOIN department dp ON dp.id = a.department_id
      WHERE ${activeSql} AND ${dept(sql`a.department_id`)}
      GROUP BY 1, 2 ORDER BY 1`)
  ).rows;
  const byDepartment = new Map<string, TierCounts>();
  for (const r of activeRows) {
    const tiers = byDepartment.get(r.department) ?? zeroTiers();
    tiers[r.tier as keyof TierCounts] += r.n;
    byDepartment.set(r.department, tiers);
  }
  const active = [...byDepartment].map(([department, tiers]) => ({
    department,
    tiers,
    total: Object.values(tiers).reduce((a, b) => a + b, 0),
  }));

  const lastExpiryDay = addDaysIso(today, EXPIRY_WINDOW_DAYS - 1);
  const expiries = (
    await db.execute<{ number: string; tier: number; department: string; holder: string; valid_to: string }>(sql`
      SELECT p.number, p.tier, dp.name AS department, u.name AS holder, p.valid_to::text AS valid_to
      FROM permit p JOIN application a ON a.id = p.application_id JOIN department dp ON dp.id = a.department_id
        JOIN app_user u ON u.id = p.holder_id
      WHERE ${activeSql} AND p.valid_to <= ${lastExpiryDay}::date AND ${dept(sql`a.department_id`)}
      ORDER BY p.valid_to, p.number`)
  ).rows.map((r) => ({
    number: r.number,
    tier: r.tier,
    department: r.department,
    holder: r.holder,
    validTo: r.valid_to,
    daysLeft: Math.round((Date.parse(`${r.valid_to}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / 86_400_000),
  }));
  // Weeks from today: days 0–6, 7–13, …; the last (days 84–89) is six days long.
  const weeks = Math.ceil(EXPIRY_WINDOW_DAYS / 7);
  const expiriesByWeek = Array.from({ length: weeks }, (_, w) => {
    const tiers = zeroTiers();
    for (const e of expiries) if (Math.floor(e.daysLeft / 7) === w) tiers[e.tier as keyof TierCounts] += 1;
    return { weekStart: addDaysIso(today, w * 7), tiers, total: Object.values(tiers).reduce((a, b) => a + b, 0) };
  });

  const incidentRows = (
    await db.execute<{ month: string; incidents: number; near_misses: number; injuries: number }>(sql`
      SELECT to_char(i.occurred_at AT TIME ZONE ${timeZone}, 'YYYY-MM') AS month,
        count(*) FILTER (WHERE i.kind = 'incident')::int AS incidents,
        count(*) FILTER (WHERE i.kind = 'near_miss')::int AS near_misses,
        count(*) FILTER (WHERE i.injuries)::int AS injuries
      FROM incident i
        LEFT JOIN permit ip ON ip.id = i.permit_id
        LEFT JOIN application ia ON ia.id = ip.application_id
        LEFT JOIN apparatus iap ON iap.id = i.apparatus_id
        JOIN app_user ir ON ir.id = i.reporter_id
      WHERE ${localDay(sql`i.occurred_at`, timeZone)} BETWEEN ${from}::date AND ${to}::date
        AND ${dept(sql`coalesce(ia.department_id, iap.department_id, ir.department_id)`)}
      GROUP BY 1`)
  ).rows;
  const incidents = monthsBetween(from, to).map((month) => {
    const row = incidentRows.find((r) => r.month === month);
    const counts = { incidents: row?.incidents ?? 0, nearMisses: row?.near_misses ?? 0, injuries: row?.injuries ?? 0 };
    return { month, ...counts, total: counts.incidents + counts.nearMisses };
  });

  return {
    filters,
    departmentName: departmentRow?.name ?? null,
    issued,
    decisionTimes,
    returns,
    active,
    expiriesByWeek,
    expiries,
    incidents,
  };
}
