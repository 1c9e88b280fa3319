import "server-only";

// The permit PDF for the approval mail comes from lib/pdf (getPermitPdf). A mail without the PDF is
// better than no mail: when rendering fails the message goes out with the link and the calendar
// file only, and the log says why.

export async function permitPdfAttachment(permitId: string): Promise<{ filename: string; bytes: Buffer } | null> {
  try {
    const { getPermitPdf } = await import("@/lib/pdf");
    const pdf = await getPermitPdf(permitId);
    return { filename: pdf.filename, bytes: pdf.bytes };
  } catch (error) {
    console.error(
      `[mail] permit ${permitId}: the permit PDF could not be rendered, sending the approval without it:`,
      error instanceof Error ? error.message : error,
    );
    return null;
  }
}
