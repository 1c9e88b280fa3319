import Link from "next/link";
import { Card } from "@/app/_components/card";
import { formatDateTime, isoDate } from "@/app/_components/format";
import type { CurrentUser } from "@/lib/auth/guards";
import { checkLog, checkTarget, mayRecordCheck } from "@/lib/checks/queries";
import { ANSWER_LABELS } from "@/lib/checks/schemas";
import { institutionTimeZone } from "@/lib/settings/queries";

// The permit page's log of pre-use checks recorded at the bench (newest first): who, when, and every
// item answered "no" with its note and photo. Reads its own data, so the page adds it in one line.

export async function PreUseCheckLog({ user, permitId }: { user: CurrentUser; permitId: string }) {
  const [log, target, timeZone] = await Promise.all([
    checkLog(user, permitId),
    checkTarget(user, permitId),
    institutionTimeZone(),
  ]);
  if (!target) return null;
  const mayRecord = mayRecordCheck(user, target) && target.inUse;
  return (
    <Card
      title="Pre-use checks"
      description="Recorded at the bench from the bench card's second QR code."
      actions={
        mayRecord ? (
          <Link
            href={`/permits/${permitId}/check`}
            className="text-sm font-medium text-ink-700 hover:text-ink-900"
            prefetch={false}
          >
            Record a check
          </Link>
        ) : undefined
      }
    >
      {log.length === 0 ? (
        <p className="text-sm text-stone-600">No pre-use check has been recorded.</p>
      ) : (
        <ol className="flex flex-col divide-y divide-stone-100 text-sm" data-testid="pre-use-check-log">
          {log.map((check) => {
            const failed = check.items.filter((item) => item.answer === "no");
            const notApplicable = check.items.filter((item) => item.answer === "na").length;
            return (
              <li key={check.id} className="py-2 first:pt-0 last:pb-0">
                <p className="flex flex-wrap items-baseline justify-between gap-x-3">
                  <span className="font-medium text-stone-900">
                    <time dateTime={isoDate(check.checkedAt)}>{formatDateTime(check.checkedAt, timeZone)}</time>
                  </span>
                  <span className={failed.length ? "font-semibold text-red-800" : "text-emerald-800"}>
                    {failed.length ? `${failed.length} “no”` : "All in order"}
                  </span>
                </p>
                <p className="text-stone-700">
                  {check.recordedByName} · {check.items.length} items
                  {notApplicable ? `, ${notApplicable} ${ANSWER_LABELS.na.toLowerCase()}` : ""}
                </p>
                {failed.length > 0 && (
                  <ul className="mt-1 list-disc pl-5 text-stone-900">
                    {failed.map((item) => (
                      <li key={item.id}>
                        {item.text}
                        {item.note && <span className="text-stone-700">: {item.note}</span>}
                        {item.photoId && (
                          <>
                            {" "}
                            <a
                              href={`/api/permits/${permitId}/checks/photos/${item.photoId}`}
                              className="text-ink-800 underline decoration-ink-300"
                            >
                              photo
                            </a>
                          </>
                        )}
                      </li>
                    ))}
                  </ul>
                )}
                {check.note && <p className="mt-1 text-stone-700">Note: {check.note}</p>}
              </li>
            );
          })}
        </ol>
      )}
    </Card>
  );
}
