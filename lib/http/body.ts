import { AppError } from "@/lib/errors";

// The one way Benchclear reads a request body: bytes are counted as they arrive and reading stops at
// the limit with 413, whether or not the client sent a Content-Length, sent a false one, or sent the
// body chunked. Nothing past the limit is ever held in memory. route() (lib/http/route.ts) reads
// every body through here — JSON bodies, uploads, and the bodies of routes that take none.

/** JSON bodies: 256 KiB (262 144 bytes) unless a route declares more. */
export const DEFAULT_BODY_LIMIT_BYTES = 256 * 1024;
/** A route that takes no body still lets a client send a little (an empty JSON object, a stray form). */
export const NO_BODY_LIMIT_BYTES = 16 * 1024;

export function payloadTooLarge(limit: number, what = "The body"): AppError {
  return new AppError("payload_too_large", `${what} is larger than ${limit} bytes.`);
}

/** A declared Content-Length already over the limit is refused before a byte is read. */
function declaredLength(request: Request): number | null {
  const raw = request.headers.get("content-length");
  if (raw === null || !/^\s*\d{1,16}\s*$/.test(raw)) return null; // absent or not a number: count instead
  return Number(raw);
}

async function consume(
  request: Request,
  limit: number,
  keep: boolean,
  tooLarge: () => AppError = () => payloadTooLarge(limit),
): Promise<{ chunks: Uint8Array[]; total: number }> {
  const declared = declaredLength(request);
  if (declared !== null && declared > limit) throw tooLarge();
  const chunks: Uint8Array[] = [];
  let total = 0;
  if (!request.body) return { chunks, total };
  const reader = request.body.getReader();
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > limit) {
        // Stop here: the rest is never read into memory. Cancelling tells the server to drop it.
        reader.cancel().catch(() => {});
        throw tooLarge();
      }
      if (keep) chunks.push(value);
    }
  } finally {
    reader.releaseLock();
  }
  return { chunks, total };
}

/** The whole body as bytes, at most `limit` of them (413 beyond, or the error `tooLarge` makes). */
export async function readBodyBytes(request: Request, limit: number, tooLarge?: () => AppError): Promise<Buffer> {
  const { chunks, total } = await consume(request, limit, true, tooLarge);
  return Buffer.concat(chunks, total);
}

/** Reads and drops a body a route does not use, still stopping at `limit` (413 beyond). */
export async function discardBody(request: Request, limit = NO_BODY_LIMIT_BYTES): Promise<void> {
  await consume(request, limit, false);
}

/** A JSON body (Content-Type application/json, else 415), at most `limit` bytes; undefined when empty. */
export async function readJsonBody(request: Request, limit = DEFAULT_BODY_LIMIT_BYTES): Promise<unknown> {
  const type = request.headers.get("content-type") ?? "";
  if (!/^application\/json\b/i.test(type)) {
    throw new AppError("unsupported_media_type", "Send the body as JSON (Content-Type: application/json).");
  }
  const bytes = await readBodyBytes(request, limit);
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new AppError("bad_request", "The body is not valid UTF-8.");
  }
  try {
    return text === "" ? undefined : JSON.parse(text);
  } catch {
    throw new AppError("bad_request", "The body is not valid JSON.");
  }
}
