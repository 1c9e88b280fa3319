import "server-only";
import { and, eq } from "drizzle-orm";
import { db } from "@/db";
import { applications, permits, type PermitState } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import type { CurrentUser } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";
import { permitScope } from "@/lib/permits/queries";
import { canonicalJson, sha256Hex } from "@/lib/signing/canonical";
import { getStorage } from "@/lib/storage";
import { checkUrlOf, loadPrintData, permitHead } from "./data";
import { renderDocument } from "./render";
import type { DocumentKind, PaperSize, PrintData } from "./types";

// Rendered permits in storage. A permit is rendered once when it becomes active and again only when
// its effective state changes (revoked, or expired once its last day has passed): each rendering
// starts from a print snapshot (data.ts) whose SHA-256 names a folder holding the snapshot and every
// document rendered from it —
//   permits/<sha256>/snapshot.json, permit-a4.pdf, permit-letter.pdf, bench-card-a4-l3.pdf, …
// The permit row records the A4 permit's key and the state it shows (pdfKey, pdfRenderedState), so a
// download costs one indexed read and a storage read until the state changes. Other sizes and the
// bench card are rendered from the same snapshot on first request, so every sheet prints the same facts.

const PRIMARY: { kind: DocumentKind; size: PaperSize } = { kind: "permit", size: "a4" };

function folderOf(key: string): string {
  return key.slice(0, key.lastIndexOf("/"));
}

function documentKey(folder: string, kind: DocumentKind, size: PaperSize): string {
  // The bench card gained its pre-use check code in layout 3. A folder rendered before keeps its
  // snapshot; its card is drawn again under the new name, with the check's address filled in.
  const edition = kind === "bench-card" ? "-l3" : "";
  return `${folder}/${kind}-${size}${edition}.pdf`;
}

export type StoredPermitPdf = { key: string; state: PermitState; number: string; rendered: boolean };

/**
 * Makes sure the stored A4 permit shows the permit's effective state, rendering it when it is missing
 * or shows an older state, and returns its storage key. Safe to call from several servers at once:
 * the same snapshot gives the same key, and the row is only updated while the permit's stored state
 * is still the one the snapshot was taken from.
 */
export async function ensurePermitPdf(permitId: string, now: Date = new Date()): Promise<StoredPermitPdf> {
  const storage = await getStorage();
  const { head, effective } = await permitHead(permitId, now);
  if (head.pdfKey && head.pdfRenderedState === effective && (await storage.exists(head.pdfKey))) {
    return { key: head.pdfKey, state: effective, number: head.number, rendered: false };
  }

  const data = await loadPrintData(permitId, now);
  const hash = sha256Hex(canonicalJson(data));
  const folder = `permits/${hash}`;
  const key = documentKey(folder, PRIMARY.kind, PRIMARY.size);
  let rendered = false;
  if (!(await storage.exists(key))) {
    // The snapshot first: whoever finds the PDF can always find the facts it was rendered from.
    await storage.put(`${folder}/snapshot.json`, Buffer.from(JSON.stringify(data)), "application/json");
    await storage.put(key, await renderDocument(data, PRIMARY.kind, PRIMARY.size), "application/pdf");
    rendered = true;
  }

  if (head.pdfKey !== key || head.pdfRenderedState !== data.permit.state) {
    await db.transaction(async (tx) => {
      const updated = await tx
        .update(permits)
        .set({ pdfKey: key, pdfRenderedState: data.permit.state })
        .where(and(eq(permits.id, permitId), eq(permits.state, head.state)))
        .returning({ id: permits.id });
      if (updated.length === 0) return;
      await writeAudit(tx, {
        actor: null,
        action: "permit.pdf_rendered",
        entityType: "permit",
        entityId: permitId,
        data: { number: head.number, state: data.permit.state, key, snapshotSha256: hash },
      });
    });
  }
  return { key, state: data.permit.state, number: head.number, rendered };
}

async function readSnapshot(folder: string, permitId: string): Promise<PrintData> {
  const storage = await getStorage();
  const stored = await storage.get(`${folder}/snapshot.json`);
  if (stored) {
    const data = JSON.parse(stored.toString("utf8")) as PrintData;
    data.permit.checkUrl ??= checkUrlOf(permitId);
    return data;
  }
  // A lost snapshot (storage restored from an older backup): the current facts are the best source.
  return loadPrintData(permitId);
}

export type PermitFile = { filename: string; bytes: Buffer };

/** A permit document as stored, rendering the one asked for from the current snapshot when missing. */
export async function getPermitDocument(
  permitId: string,
  options: { kind: DocumentKind; size: PaperSize; now?: Date },
): Promise<PermitFile> {
  const storage = await getStorage();
  const primary = await ensurePermitPdf(permitId, options.now);
  const key = documentKey(folderOf(primary.key), options.kind, options.size);
  let bytes = await storage.get(key);
  if (!bytes) {
    const data = await readSnapshot(folderOf(primary.key), permitId);
    bytes = await renderDocument(data, options.kind, options.size);
    await storage.put(key, bytes, "application/pdf");
  }
  const suffix = options.kind === "permit" ? "" : `-${options.kind}`;
  return { filename: `${primary.number}${suffix}.pdf`, bytes };
}

/** The A4 permit for the approval e-mail (lib/mail): rendered on first use, then read from storage. */
export async function getPermitPdf(permitId: string): Promise<PermitFile> {
  return getPermitDocument(permitId, PRIMARY);
}

/**
 * A permit document for a signed-in user who may see the permit: its holder, the people named on its
 * application, reviewers of its department and safety officers (lib/permits permitScope, the same
 * rule as the permit pages). Anyone else gets the same 404 as for a permit that does not exist.
 */
export async function getPermitDocumentFor(
  user: CurrentUser,
  permitId: string,
  options: { kind: DocumentKind; size: PaperSize },
): Promise<PermitFile> {
  const [visible] = await db
    .select({ id: permits.id })
    .from(permits)
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .where(and(eq(permits.id, permitId), permitScope(user)))
    .limit(1);
  if (!visible) throw notFound("That permit");
  return getPermitDocument(permitId, options);
}
