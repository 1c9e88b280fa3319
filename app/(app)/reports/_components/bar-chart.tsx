"use client";

import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";

// One bar chart of the committee report, drawn with Recharts (imported by this route only, so no
// other page loads it). The chart is a picture for sighted readers: it is hidden from assistive
// technology, and the table printed with it (ReportSection) carries the same figures as text.

export type Series = { key: string; label: string; colour: string };

export function ReportBarChart({
  data,
  xKey,
  series,
  stacked = false,
  yLabel,
  height = 260,
}: {
  data: Record<string, string | number | null>[];
  xKey: string;
  series: Series[];
  stacked?: boolean;
  yLabel: string;
  height?: number;
}) {
  return (
    <div aria-hidden="true" className="w-full" style={{ height }}>
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} margin={{ top: 8, right: 8, bottom: 4, left: 4 }} accessibilityLayer={false}>
          <CartesianGrid strokeDasharray="3 3" vertical={false} stroke="#e7e5e4" />
          <XAxis dataKey={xKey} tick={{ fontSize: 12, fill: "#44403c" }} />
          <YAxis
            allowDecimals={false}
            tick={{ fontSize: 12, fill: "#44403c" }}
            width={44}
            label={{ value: yLabel, angle: -90, position: "insideLeft", fontSize: 12, fill: "#44403c" }}
          />
          <Tooltip />
          <Legend wrapperStyle={{ fontSize: 12 }} />
          {series.map((s) => (
            <Bar
              key={s.key}
              dataKey={s.key}
              name={s.label}
              fill={s.colour}
              stackId={stacked ? "stack" : undefined}
              isAnimationActive={false}
            />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}
