// The bench card's second QR code (issue 17, item 2): beside the public status code, a code that opens
// the signed-in pre-use check, each captioned, still on one page in both paper sizes.
import { describe, expect, it } from "vitest";
import { renderDocument } from "@/lib/pdf/render";
import { samplePrintData } from "../pdf/samples";
import { decodeQrs, folded, pdfInfo, pdfText } from "../pdf/support";

describe("bench card", () => {
  // Letter is read back through the download route (tests/pdf/routes.test.ts).
  for (const size of ["a4"] as const) {
    it(`carries the status code and the "Record a pre-use check" code on one ${size} page`, async () => {
      const checkUrl = "https://benchclear.aldermere.test/permits/6f1d2b7a-1c3e-4f5a-8b9c-0d1e2f3a4b5c/check";
      const data = samplePrintData(4, { checkUrl });
      const pdf = await renderDocument(data, "bench-card", size);
      expect(pdfInfo(pdf).pages).toBe(1);
      // The codes sit in the card's header, in the top 45 % of the page.
      expect(decodeQrs(pdf, 2, 0.45).sort()).toEqual([checkUrl, data.permit.verificationUrl].sort());
      const text = folded(pdfText(pdf));
      expect(text).toContain("Record a pre-use check");
      expect(text).toContain("Scan to check this permit is still valid");
      expect(text).toContain(`Pre-use check: ${checkUrl}`);
    });
  }
});
