import type { Metadata } from "next";
import { Card } from "@/app/_components/card";
import { PageHeader } from "@/app/_components/page-header";
import { requirePageUser } from "@/lib/auth/guards";
import { formatQuantity, REFERENCES, referenceAnchor, statusText, type Threshold } from "@/lib/hazard";
import { currentTierRules } from "@/lib/hazard-rules";

export const metadata: Metadata = { title: "References" };

/** Every threshold of the rules in force, with the reference it cites. */
function thresholdsOf(rules: Record<string, unknown>): Array<{ path: string; threshold: Threshold }> {
  const out: Array<{ path: string; threshold: Threshold }> = [];
  for (const [group, value] of Object.entries(rules)) {
    if (!value || typeof value !== "object" || Array.isArray(value)) continue;
    const record = value as Record<string, unknown>;
    if (typeof record.value === "number") {
      out.push({ path: group, threshold: record as unknown as Threshold });
      continue;
    }
    for (const [key, inner] of Object.entries(record)) {
      if (inner && typeof inner === "object" && typeof (inner as Threshold).value === "number") {
        out.push({ path: `${group}.${key}`, threshold: inner as Threshold });
      }
    }
  }
  return out;
}

export default async function ReferencesPage() {
  await requirePageUser(undefined, "/references");
  const rules = await currentTierRules();
  const thresholds = thresholdsOf(rules as unknown as Record<string, unknown>);
  return (
    <>
      <PageHeader
        title="References"
        description="The publications behind every threshold, reason and flag, and how each value was obtained: read in the text, recalled from memory, or a rule of the trade. Local codes, institutional rules and qualified persons take precedence."
      />
      <div className="flex max-w-4xl flex-col gap-4">
        {REFERENCES.map((ref) => {
          const used = thresholds.filter((t) => t.threshold.ref === ref.id);
          return (
            <div key={ref.id} id={referenceAnchor(ref.id)} className="scroll-mt-20">
              <Card title={ref.title}>
                <dl className="grid grid-cols-[8rem_1fr] gap-x-3 gap-y-1 text-sm">
                  <dt className="text-stone-600">Edition</dt>
                  <dd className="text-stone-900">{ref.edition || "—"}</dd>
                  <dt className="text-stone-600">Clause</dt>
                  <dd className="text-stone-900">{ref.clause}</dd>
                  <dt className="text-stone-600">Value obtained</dt>
                  <dd className="font-medium text-stone-900">{statusText(ref.status)}</dd>
                  <dt className="text-stone-600">Note</dt>
                  <dd className="text-stone-800">{ref.note}</dd>
                </dl>
                {used.length > 0 && (
                  <>
                    <h3 className="mt-3 text-sm font-semibold text-stone-900">Thresholds that cite it</h3>
                    <ul className="mt-1 list-disc pl-5 text-sm text-stone-800">
                      {used.map(({ path, threshold }) => (
                        <li key={path}>
                          <span className="figure">{formatQuantity(threshold.value, threshold.unit)}</span>{" "}
                          <span className="text-stone-600">({path})</span>
                        </li>
                      ))}
                    </ul>
                  </>
                )}
              </Card>
            </div>
          );
        })}
      </div>
    </>
  );
}
