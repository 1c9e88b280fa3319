import type { Metadata } from "next";
import { db } from "@/db";
import { Card } from "@/app/_components/card";
import { formatDateTime } from "@/app/_components/format";
import { institutionTimeZone } from "@/lib/settings/queries";
import { PageHeader } from "@/app/_components/page-header";
import { requirePageUser } from "@/lib/auth/guards";
import { verifyRecords, type Break } from "@/lib/records/verify";

// /admin/records: walks the audit hash chain and every decision's seal when opened, and names the
// first broken link of each (lib/records/verify.ts; `npm run verify:records` does the same).

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Records" };

function Outcome({ ok, broken, good }: { ok: boolean; broken: Break | null; good: string }) {
  if (ok || !broken) {
    return (
      <p className="text-sm text-emerald-800">
        <span className="font-semibold">Intact.</span> {good}
      </p>
    );
  }
  return (
    <div role="alert" className="rounded-md border-2 border-red-700 bg-red-50 px-3 py-2 text-sm text-stone-900">
      <p className="font-semibold">Broken at {broken.where}</p>
      <p>{broken.reason}</p>
      <p className="mt-1">
        Everything from here on cannot be relied on. Keep the database as it is, and restore the last backup into a
        separate database to compare.
      </p>
    </div>
  );
}

export default async function RecordsPage() {
  await requirePageUser("admin.records", "/admin/records");
  const [report, timeZone] = await Promise.all([verifyRecords(db), institutionTimeZone()]);
  return (
    <>
      <PageHeader
        title="Records"
        description="Checks that the audit trail and the signed decisions are as they were written. Run when this page opens."
      />
      <div className="grid gap-6 lg:grid-cols-2">
        <Card
          title="Audit trail"
          description="Each event carries the hash of the one before it; a changed, removed or inserted event breaks the chain from there on."
        >
          <Outcome
            ok={!report.chain.firstBreak}
            broken={report.chain.firstBreak}
            good={`${report.chain.rows} events, chained from ${report.chain.firstRowAt ?? "the first event"}.`}
          />
          {report.chain.head && (
            <p className="mt-2 text-xs break-all text-stone-600">
              Head: link {report.chain.head.seq}, <span className="figure">{report.chain.head.hash}</span>. Noting this
              value somewhere outside the database lets a later check show nothing was rewritten since.
            </p>
          )}
        </Card>
        <Card
          title="Signed decisions"
          description="Each decision is sealed with a key kept outside the database, over its kind, signer, time, revision hash, conditions and validity."
        >
          <Outcome
            ok={!report.decisions.firstBreak}
            broken={report.decisions.firstBreak}
            good={`${report.decisions.checked} decisions checked; each seal, signed revision and permit agree.`}
          />
        </Card>
      </div>
      <p className="mt-4 text-sm text-stone-600">Checked {formatDateTime(new Date(report.checkedAt), timeZone)}.</p>
    </>
  );
}
