import { TIER_LABELS } from "@/lib/hazard/rules";
import type { Tier } from "@/lib/hazard/types";
import { addDaysIso, formatHours } from "./range";
import type { Report } from "./queries";
import type { ReportChart } from "./schemas";

// Each chart's figures as one table: the page prints it beside the chart (the text a screen reader
// reads), the CSV route exports it, the PDF prints it. One definition, so the three never disagree.
// `csv` is the CSV header (snake_case, units in the name); `label` what a person reads.

export type ReportTable = {
  columns: { csv: string; label: string; numeric?: boolean }[];
  rows: (string | number | null)[][];
};

const TIERS = [0, 1, 2, 3, 4] as const;
const tierColumns = TIERS.map((t) => ({ csv: `tier_${t}`, label: `Tier ${t}`, numeric: true }));
const round1 = (v: number | null) => (v === null ? null : Math.round(v * 10) / 10);

export const tierName = (tier: number) => `Tier ${tier} · ${TIER_LABELS[tier as Tier]}`;

export function reportTable(report: Report, chart: ReportChart): ReportTable {
  switch (chart) {
    case "issued":
      return {
        columns: [{ csv: "month", label: "Month" }, ...tierColumns, { csv: "total", label: "Total", numeric: true }],
        rows: report.issued.map((m) => [m.month, ...TIERS.map((t) => m.tiers[t]), m.total]),
      };
    case "decision-times":
      return {
        columns: [
          { csv: "tier", label: "Tier" },
          { csv: "decisions", label: "Decisions", numeric: true },
          { csv: "median_hours", label: "Median", numeric: true },
          { csv: "p90_hours", label: "90th percentile", numeric: true },
        ],
        rows: report.decisionTimes.map((d) => [d.tier, d.decisions, round1(d.medianHours), round1(d.p90Hours)]),
      };
    case "returns":
      return {
        columns: [
          { csv: "tier", label: "Tier" },
          { csv: "applications", label: "Applications", numeric: true },
          { csv: "returns", label: "Returns", numeric: true },
          { csv: "returns_per_application", label: "Returns per application", numeric: true },
          { csv: "came_back_0", label: "Never returned", numeric: true },
          { csv: "came_back_1", label: "Returned once", numeric: true },
          { csv: "came_back_2", label: "Twice", numeric: true },
          { csv: "came_back_3_or_more", label: "3 times or more", numeric: true },
        ],
        rows: report.returns.map((r) => [
          r.tier,
          r.applications,
          r.returns,
          r.applications ? Math.round((r.returns / r.applications) * 100) / 100 : 0,
          ...r.buckets,
        ]),
      };
    case "active":
      return {
        columns: [
          { csv: "department", label: "Department" },
          ...tierColumns,
          { csv: "total", label: "Total", numeric: true },
        ],
        rows: report.active.map((a) => [a.department, ...TIERS.map((t) => a.tiers[t]), a.total]),
      };
    case "expiries":
      return {
        columns: [
          { csv: "permit", label: "Permit" },
          { csv: "tier", label: "Tier" },
          { csv: "department", label: "Department" },
          { csv: "holder", label: "Holder" },
          { csv: "valid_to", label: "Last valid day" },
          { csv: "days_left", label: "Days left", numeric: true },
        ],
        rows: report.expiries.map((e) => [e.number, e.tier, e.department, e.holder, e.validTo, e.daysLeft]),
      };
    case "incidents":
      return {
        columns: [
          { csv: "month", label: "Month" },
          { csv: "incidents", label: "Incidents", numeric: true },
          { csv: "near_misses", label: "Near misses", numeric: true },
          { csv: "with_injuries", label: "Someone hurt", numeric: true },
          { csv: "total", label: "Total", numeric: true },
        ],
        rows: report.incidents.map((m) => [m.month, m.incidents, m.nearMisses, m.injuries, m.total]),
      };
  }
}

/** A table cell as a person reads it (hours as "5.0 h" / "3.2 d", tiers with their label). */
export function displayCell(chart: ReportChart, column: string, value: string | number | null): string {
  if (value === null) return "—";
  if (column === "tier") return tierName(Number(value));
  if (chart === "decision-times" && (column === "median_hours" || column === "p90_hours"))
    return formatHours(Number(value));
  return String(value);
}

export const weekLabel = (weekStart: string) => `${weekStart.slice(5)}–${addDaysIso(weekStart, 6).slice(5)}`;
