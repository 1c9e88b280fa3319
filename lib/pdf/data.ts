import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import { db } from "@/db";
import { joinPermitBase } from "@/lib/permits/base-query";
import { applicationRevisions, applications, decisions, permits, users, type PermitState } from "@/db/schema";
import { isRole, ROLE_LABELS } from "@/lib/roles";
import { env } from "@/lib/env";
import { readInstitutionSettings } from "@/lib/settings/queries";
import { TIER_LABELS, type Assessment, type SetupInput, type Tier } from "@/lib/hazard";
import { notFound } from "@/lib/errors";
import { effectivePermitState, todayIn } from "@/lib/permits/dates";
import { AUDIENCE_LABELS, EVENT_KIND_LABELS } from "@/lib/applications/schemas";
import { verificationUrl } from "@/lib/verify/code";
import type { PrintData } from "./types";

// Gathers a permit's print snapshot from the database. The application content was validated when it
// was submitted (applicationContentSchema); it is read defensively here so that a revision frozen
// under an older shape still prints rather than failing at the bench.

/** Bump when the printed layout changes so stored files are rendered again. */
// 3: the bench card carries a second QR code, for recording a pre-use check.
export const LAYOUT_VERSION = 3;

const DEFAULT_INSTITUTION = "Benchclear";

export type PermitHead = {
  id: string;
  number: string;
  state: PermitState;
  validTo: string;
  pdfKey: string | null;
  pdfRenderedState: PermitState | null;
};

/** The permit row's few columns that decide whether its stored PDF is current, and the effective state. */
export async function permitHead(permitId: string, now: Date): Promise<{ head: PermitHead; effective: PermitState }> {
  const [[head], timeZone] = await Promise.all([
    db
      .select({
        id: permits.id,
        number: permits.number,
        state: permits.state,
        validTo: permits.validTo,
        pdfKey: permits.pdfKey,
        pdfRenderedState: permits.pdfRenderedState,
      })
      .from(permits)
      .where(eq(permits.id, permitId))
      .limit(1),
    readSettings().then((s) => s.timeZone),
  ]);
  if (!head) throw notFound("That permit");
  return { head, effective: effectivePermitState(head, todayIn(timeZone, now)) };
}

async function readSettings() {
  const settings = await readInstitutionSettings();
  return { ...settings, name: settings.name ?? DEFAULT_INSTITUTION };
}

type Loose = Record<string, unknown>;
const obj = (value: unknown): Loose =>
  value && typeof value === "object" && !Array.isArray(value) ? (value as Loose) : {};
const str = (value: unknown): string => (typeof value === "string" ? value : "");
const arr = (value: unknown): unknown[] => (Array.isArray(value) ? value : []);

function roleLabel(role: string): string {
  return isRole(role) ? ROLE_LABELS[role] : role;
}

/** The signed-in pre-use check page of a permit, behind the bench card's second QR code. */
export function checkUrlOf(permitId: string): string {
  return `${env().APP_URL.replace(/\/+$/, "")}/permits/${permitId}/check`;
}

export async function loadPrintData(permitId: string, now: Date = new Date()): Promise<PrintData> {
  const [row] = await joinPermitBase(
    db
      .select({
        number: permits.number,
        state: permits.state,
        tier: permits.tier,
        validFrom: permits.validFrom,
        validTo: permits.validTo,
        validityReason: permits.validityReason,
        issuedAt: permits.issuedAt,
        revokedAt: permits.revokedAt,
        revokedReason: permits.revokedReason,
        conditions: permits.conditions,
        verificationCode: permits.verificationCode,
        revisionId: permits.revisionId,
        holderName: users.name,
        title: applications.title,
        content: applicationRevisions.content,
        assessment: applicationRevisions.assessment,
      })
      .from(permits)
      .$dynamic(),
  )
    .where(eq(permits.id, permitId))
    .limit(1);
  if (!row) throw notFound("That permit");

  const [settings, signatures] = await Promise.all([
    readSettings(),
    db
      .select({
        name: decisions.signerName,
        role: decisions.signerRole,
        meaning: decisions.meaning,
        kind: decisions.kind,
        signedAt: decisions.signedAt,
      })
      .from(decisions)
      .where(and(eq(decisions.revisionId, row.revisionId), inArray(decisions.kind, ["recommend", "approve", "revoke"])))
      .orderBy(asc(decisions.signedAt)),
  ]);

  const content = obj(row.content);
  const event = obj(content.event);
  const apparatus = obj(content.apparatus);
  const controls = obj(content.controls);
  const assessment = row.assessment as Assessment;
  const tier = row.tier as Tier;
  const kind = str(event.kind) as keyof typeof EVENT_KIND_LABELS;
  const audience = str(event.audience) as keyof typeof AUDIENCE_LABELS;

  return {
    layoutVersion: LAYOUT_VERSION,
    institution: {
      name: settings.name,
      emergencyContacts: settings.emergencyContacts,
      timeZone: settings.timeZone,
    },
    permit: {
      number: row.number,
      state: effectivePermitState(row, todayIn(settings.timeZone, now)),
      tier,
      tierLabel: assessment.tier === tier && assessment.tierLabel ? assessment.tierLabel : TIER_LABELS[tier],
      validFrom: row.validFrom,
      validTo: row.validTo,
      validityReason: row.validityReason,
      issuedAt: row.issuedAt.toISOString(),
      revokedOn: row.revokedAt ? todayIn(settings.timeZone, row.revokedAt) : null,
      revokedReason: row.revokedReason,
      conditions: row.conditions,
      verificationCode: row.verificationCode,
      verificationUrl: verificationUrl(env().APP_URL, row.verificationCode),
      checkUrl: checkUrlOf(permitId),
    },
    holderName: row.holderName,
    event: {
      title: str(event.title) || row.title,
      kindLabel: EVENT_KIND_LABELS[kind] ?? "",
      room: str(event.room),
      audienceLabel: AUDIENCE_LABELS[audience] ?? "",
      audienceSize: typeof event.audienceSize === "number" ? event.audienceSize : 0,
      firstDay: str(event.firstDay),
      lastDay: str(event.lastDay),
      responsible: str(obj(event.responsible).name) || row.holderName,
      operators: arr(event.operators).map((o) => ({ name: str(obj(o).name), trained: obj(o).trained === true })),
    },
    apparatus: { name: str(apparatus.name), room: str(apparatus.room), notes: str(apparatus.notes) },
    setup: { ...obj(apparatus.setup), sources: arr(obj(apparatus.setup).sources) } as SetupInput,
    assessment,
    controls: arr(controls.required).map((c) => ({
      text: str(obj(c).text),
      confirmed: obj(c).confirmed === true,
      note: str(obj(c).note),
    })),
    additionalControls: str(controls.additional),
    signatures: signatures.map((s) => ({
      name: s.name,
      role: roleLabel(s.role),
      meaning: s.meaning,
      kind: s.kind,
      signedAt: s.signedAt.toISOString(),
    })),
  };
}
