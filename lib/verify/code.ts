// Verification codes: the random part of the URL behind a permit's QR code, issued by lib/permits as
// 32 random bytes in base64url (43 characters, 256 bits), far above the 128 bits security.md asks
// for, so guessing one is hopeless and the public page's rate limit only has to stop scraping.

/** Base64url text long enough for 128 bits (22 characters) and no longer than any code we issue. */
const CODE_PATTERN = /^[A-Za-z0-9_-]{22,128}$/;

export function isWellFormedCode(code: string): boolean {
  return CODE_PATTERN.test(code);
}

/** The public address a permit's QR code opens. */
export function verificationUrl(appUrl: string, code: string): string {
  return `${appUrl.replace(/\/+$/, "")}/verify/${encodeURIComponent(code)}`;
}
