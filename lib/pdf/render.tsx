import { renderToBuffer } from "@react-pdf/renderer";
import { AssessmentDocument } from "./assessment-document";
import { BenchCardDocument } from "./bench-card-document";
import { registerFonts } from "./fonts";
import { PermitDocument } from "./permit-document";
import { qrDataUrl } from "./qr";
import type { DocumentKind, PaperSize, PrintData } from "./types";

// Renders a permit or bench card from a print snapshot. No database and no server-only imports, so
// the benchmark (scripts/bench/pdf.ts) and the tests call it directly.

/** Type sizes tried for the bench card, largest first, until it fits one page. */
const BENCH_CARD_SCALES = [1, 0.9, 0.8, 0.7, 0.6];

/** Pages in a PDF written by react-pdf (pdfkit writes every page object uncompressed). */
export function countPages(pdf: Buffer): number {
  return pdf.toString("latin1").match(/\/Type\s*\/Page\b/g)?.length ?? 0;
}

export async function renderDocument(data: PrintData, kind: DocumentKind, size: PaperSize): Promise<Buffer> {
  registerFonts();
  if (kind === "assessment") return renderToBuffer(<AssessmentDocument data={data} size={size} />);
  const qr = await qrDataUrl(data.permit.verificationUrl);
  if (kind === "permit") return renderToBuffer(<PermitDocument data={data} size={size} qr={qr} />);
  const checkQr = data.permit.checkUrl ? await qrDataUrl(data.permit.checkUrl) : null;
  let pdf: Buffer | undefined;
  for (const scale of BENCH_CARD_SCALES) {
    pdf = await renderToBuffer(<BenchCardDocument data={data} size={size} qr={qr} checkQr={checkQr} scale={scale} />);
    if (countPages(pdf) === 1) return pdf;
  }
  return pdf!;
}
