import { Card } from "@/app/_components/card";
import type { DiffEntry } from "@/lib/review/diff";

/** What changed between two revisions, field by field, grouped by part of the form. */
export function RevisionDiff({ entries, from, to }: { entries: readonly DiffEntry[]; from: number; to: number }) {
  return (
    <Card
      title={`Changes since revision ${from}`}
      description={`Revision ${to} against revision ${from}: event details, energy sources, controls and the figures that follow.`}
      flush
    >
      {entries.length === 0 ? (
        <p className="px-4 py-3 text-sm text-stone-600">
          Nothing changed: revision {to} is the same as revision {from}.
        </p>
      ) : (
        <div role="group" aria-label={`Changes since revision ${from}`} tabIndex={0} className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Changed fields</caption>
            <thead className="border-b border-stone-200 bg-stone-50 text-xs tracking-wide text-stone-600 uppercase">
              <tr>
                <th scope="col" className="px-4 py-2 font-medium">
                  Field
                </th>
                <th scope="col" className="px-4 py-2 font-medium">
                  Revision {from}
                </th>
                <th scope="col" className="px-4 py-2 font-medium">
                  Revision {to}
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-stone-100">
              {entries.map((e) => (
                <tr key={e.path} className="align-top">
                  <th scope="row" className="px-4 py-2 font-normal">
                    <span className="block text-xs text-stone-600">{e.section}</span>
                    <span className="text-stone-900">{e.label}</span>
                  </th>
                  <td className="px-4 py-2 text-stone-700">
                    <del className="decoration-red-700/60">{e.before}</del>
                  </td>
                  <td className="px-4 py-2 text-stone-900">
                    <ins className="bg-emerald-50 no-underline">{e.after}</ins>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </Card>
  );
}
