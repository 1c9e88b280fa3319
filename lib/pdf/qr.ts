import QRCode from "qrcode";

// The QR code behind every printed permit, as a PNG data URL for react-pdf's <Image>. Error
// correction level M survives a scuffed or partly taped-over lamination; the four-module quiet
// zone is the minimum readers need (ISO/IEC 18004).
export async function qrDataUrl(text: string): Promise<string> {
  return QRCode.toDataURL(text, { errorCorrectionLevel: "M", margin: 4, scale: 10, type: "image/png" });
}
