import { formatSignedAt, isoDate } from "@/app/_components/format";
import { DECISION_LABELS } from "@/lib/signing/meanings";
import type { DecisionKind } from "@/db/schema";

export type SignatureItem = {
  id: string;
  kind: DecisionKind;
  step: number | null;
  signerName: string;
  signerRole: string;
  meaning: string;
  contentHash: string;
  signedAt: Date | string;
  comment?: string | null;
  revision?: number;
};

/** Signed decisions as a record: who (printed name and role), what it means, when (institution zone and UTC), over which content. */
export function SignatureList({
  items,
  empty = "No signatures yet.",
  timeZone,
}: {
  items: readonly SignatureItem[];
  empty?: string;
  /** The institution's time zone (IANA name). */
  timeZone: string;
}) {
  if (items.length === 0) return <p className="text-sm text-stone-600">{empty}</p>;
  return (
    <ol className="flex flex-col gap-3">
      {items.map((s) => (
        <li key={s.id} className="rounded-md border border-stone-200 bg-stone-50/60 px-3 py-2 text-sm">
          <p className="font-medium text-stone-900">
            {DECISION_LABELS[s.kind]}
            {s.step !== null && <span className="font-normal text-stone-600"> · step {s.step}</span>}
            {s.revision !== undefined && <span className="font-normal text-stone-600"> · revision {s.revision}</span>}
          </p>
          <p className="text-stone-800">
            {s.signerName} <span className="text-stone-600">({s.signerRole})</span>
          </p>
          <p className="text-stone-700">{s.meaning}</p>
          {s.comment && (
            <p className="mt-1 border-l-2 border-stone-300 pl-2 whitespace-pre-line text-stone-800">{s.comment}</p>
          )}
          <p className="mt-1 text-xs text-stone-600">
            <time dateTime={isoDate(s.signedAt)}>{formatSignedAt(s.signedAt, timeZone)}</time>
            <span className="mx-1">·</span>
            <span>
              SHA-256 <span className="figure break-all">{s.contentHash}</span>
            </span>
          </p>
        </li>
      ))}
    </ol>
  );
}
