import { DataTable } from "@/app/_components/data-table";
import { STATUS_LABELS } from "@/lib/training/status";
import type { TrainingRecordRow } from "@/lib/training/queries";

// One person's training record: each course, when it was completed, by whom, the day it lapses and
// its status today (a newer completion of the same course replaces an older one). Used by the
// account page (your own) and the training page (officers).

const STATUS_CLASS: Record<TrainingRecordRow["status"], string> = {
  current: "text-teal-800",
  lapses: "font-medium text-red-800",
  missing: "font-medium text-red-800",
  superseded: "text-stone-500",
};

export function TrainingRecordsTable({ records, caption }: { records: TrainingRecordRow[]; caption: string }) {
  return (
    <DataTable
      caption={caption}
      rows={records}
      rowKey={(r) => r.id}
      empty="No training recorded yet. A safety officer records courses on the Training page."
      columns={[
        { key: "course", header: "Course", rowHeader: true, cell: (r) => r.course },
        { key: "completed", header: "Completed", figure: true, cell: (r) => r.completedOn },
        { key: "lapses", header: "Lapses on", figure: true, cell: (r) => r.lapsesOn },
        {
          key: "status",
          header: "Status",
          cell: (r) => <span className={STATUS_CLASS[r.status]}>{STATUS_LABELS[r.status]}</span>,
        },
        { key: "trainer", header: "Trainer", hideBelow: "md", cell: (r) => r.trainer },
        {
          key: "certificate",
          header: "Certificate",
          hideBelow: "sm",
          cell: (r) =>
            r.certificateFilename ? (
              <a href={`/api/training/records/${r.id}/certificate`} className="underline">
                {r.certificateFilename}
              </a>
            ) : (
              <span className="text-stone-500">none</span>
            ),
        },
      ]}
    />
  );
}
