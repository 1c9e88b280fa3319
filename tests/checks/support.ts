// Pre-use check fixtures: a permit's checklist answered as the phone would send it.
import crypto from "node:crypto";
import { buildChecklist } from "@/lib/checks/checklist";
import type { PermitFixture } from "../pdf/support";

/** The checklist of a fixture permit, as the server builds it (the controls its revision confirmed). */
export function checklistOf(f: Pick<PermitFixture, "content" | "permit" | "assessment">) {
  return buildChecklist({
    tier: f.permit.tier,
    controls: f.content.controls.required.map((c) => ({ code: c.code, text: c.text })),
    conditions: f.permit.conditions,
    limitedApproach_m: f.assessment.approach.limited_m,
  });
}

/** A full check body: every item "yes" unless `answers` says otherwise. */
export function checkBody(
  f: Pick<PermitFixture, "content" | "permit" | "assessment">,
  answers: Record<string, { answer: "yes" | "no" | "na"; note?: string; photoId?: string }> = {},
  idempotencyKey: string = crypto.randomUUID(),
) {
  return {
    idempotencyKey,
    items: checklistOf(f).map((item) => ({
      id: item.id,
      answer: answers[item.id]?.answer ?? "yes",
      note: answers[item.id]?.note ?? "",
      photoId: answers[item.id]?.photoId ?? null,
    })),
    note: "",
  };
}
