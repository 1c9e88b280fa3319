import type { Metadata } from "next";
import { buttonClasses } from "@/app/_components/button-classes";
import { Card } from "@/app/_components/card";
import { DataTable, type Column } from "@/app/_components/data-table";
import { formatDate, formatDateTime } from "@/app/_components/format";
import { PageHeader } from "@/app/_components/page-header";
import type { Tier } from "@/app/_components/tier";
import { TierBadge } from "@/app/_components/tier-badge";
import { requirePageUser } from "@/lib/auth/guards";
import { liveSheet, type LiveRow } from "@/lib/permits/live";
import { hazardHeader } from "@/lib/signal-word";

export const metadata: Metadata = { title: "Live high voltage now" };

// Where high voltage is live today, building by building, room by room: for the safety office and
// for emergency responders (whose account sees this page and nothing else). The one-page PDF beside it
// is the same list for the fire service's clipboard.

function SignalWord({ tier }: { tier: number }) {
  const header = hazardHeader(tier as Tier);
  if (!header) return <span className="text-stone-600">none (touch-safe)</span>;
  return (
    <span
      className="inline-block rounded-sm px-1.5 py-0.5 text-xs font-bold tracking-wide"
      style={{ backgroundColor: header.panel, color: header.ink }}
    >
      {header.word}
    </span>
  );
}

const columns: Column<LiveRow>[] = [
  { key: "room", header: "Room", rowHeader: true, cell: (r) => r.room },
  { key: "tier", header: "Tier", cell: (r) => <TierBadge tier={r.tier as Tier} size="sm" /> },
  { key: "signal", header: "Signal word", cell: (r) => <SignalWord tier={r.tier} /> },
  {
    key: "setup",
    header: "Set-up",
    cell: (r) => (
      <>
        <span className="block">{r.apparatusName || r.title}</span>
        <span className="figure block text-xs text-stone-600">{r.number}</span>
      </>
    ),
  },
  {
    key: "holder",
    header: "Holder",
    cell: (r) => (
      <>
        <span className="block">{r.holderName}</span>
        <span className="block text-xs text-stone-600">{r.departmentName}</span>
      </>
    ),
  },
  { key: "phone", header: "Emergency phone", figure: true, cell: (r) => r.emergencyPhone ?? "not set" },
  { key: "until", header: "Valid until", figure: true, hideBelow: "md", cell: (r) => formatDate(r.validTo) },
];

export default async function LivePage() {
  const user = await requirePageUser("live.read", "/live");
  const sheet = await liveSheet(user);
  // Rows arrive in walking order, so grouping keeps the buildings in that order too.
  const buildings = new Map<string, LiveRow[]>();
  for (const row of sheet.rows) buildings.set(row.building, [...(buildings.get(row.building) ?? []), row]);

  return (
    <>
      <PageHeader
        title="Live high voltage now"
        description={`Every set-up with an active permit on ${formatDate(sheet.today)} (${sheet.timeZone}), building by building in walking order. Read at ${formatDateTime(sheet.readAt, sheet.timeZone)}.`}
        actions={
          <a href="/live/pdf" className={buttonClasses({ variant: "secondary" })} download>
            Print sheet (PDF, one page)
          </a>
        }
      />

      <Card title="In an emergency call" className="mb-6">
        {sheet.contacts.length === 0 ? (
          <p className="text-sm font-medium text-red-800">
            No emergency contacts are set. Ask the safety office; an admin adds them on the Rules page.
          </p>
        ) : (
          <ul className="grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
            {sheet.contacts.map((c) => (
              <li key={`${c.label}${c.phone}`} className="text-sm">
                <span className="block text-stone-700">{c.label}</span>
                <a href={`tel:${c.phone.replace(/[^\d+]/g, "")}`} className="figure text-lg font-semibold">
                  {c.phone}
                </a>
              </li>
            ))}
          </ul>
        )}
      </Card>

      {sheet.rows.length === 0 ? (
        <Card>
          <p className="text-sm text-stone-700">No set-up holds an active permit today.</p>
        </Card>
      ) : (
        <div className="flex flex-col gap-6">
          {[...buildings].map(([building, rows]) => (
            <Card
              key={building}
              title={building}
              description={`${rows.length} live ${rows.length === 1 ? "set-up" : "set-ups"}`}
              flush
            >
              <DataTable
                caption={`Live set-ups in ${building}`}
                columns={columns}
                rows={rows}
                rowKey={(r) => r.permitId}
              />
            </Card>
          ))}
        </div>
      )}
      <p className="mt-6 max-w-prose text-sm text-stone-600">
        A set-up is live on the days its permit is valid; it may be switched off at any given moment. Treat every listed
        set-up as energised until a qualified person has de-energised and grounded it.
      </p>
    </>
  );
}
