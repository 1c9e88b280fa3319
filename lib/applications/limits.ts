// Upload limits, shared by the form (to refuse early with the same words) and the server (which
// decides). 10 MB is decimal (SI, like every figure in Benchclear): 10 000 000 bytes, which also
// stays below the 10 MiB that Next.js buffers for a request passing through proxy.ts.

export const ATTACHMENT_MAX_BYTES = 10_000_000;
export const ATTACHMENT_MAX_COUNT = 10;
/** Multipart framing around one file is a few hundred bytes; 64 KiB is generous. */
export const ATTACHMENT_REQUEST_MAX_BYTES = ATTACHMENT_MAX_BYTES + 64 * 1024;

/** The allow-list, by the type read from the content, with the extension used for storage keys. */
export const ATTACHMENT_TYPES = {
  "image/jpeg": "jpg",
  "image/png": "png",
  "image/webp": "webp",
  "application/pdf": "pdf",
} as const;

export const ATTACHMENT_ACCEPT = ".jpg,.jpeg,.png,.webp,.pdf,image/jpeg,image/png,image/webp,application/pdf";

export function isImageType(contentType: string): boolean {
  return contentType.startsWith("image/");
}

/** "2.40 MB", "512 kB", "900 B": decimal prefixes, three significant digits. */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  if (bytes < 1_000_000) return `${(bytes / 1000).toPrecision(3)} kB`;
  return `${(bytes / 1_000_000).toPrecision(3)} MB`;
}
