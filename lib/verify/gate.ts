import "server-only";
import { countVerifyLookup, peekVerifyLookup } from "./limit";

// For proxy.ts, in front of /verify/[code]: an App Router page cannot choose its HTTP status or add
// response headers, so the proxy counts each look-up and answers a client over the limit with a real
// 429 (and Retry-After) before the page renders, and marks every verification answer noindex. A page
// request the proxy did not count (no valid token) is counted by the page itself (lib/verify/index.ts),
// so the limit holds without the proxy, and no look-up is counted twice.

export const VERIFY_PATH_PREFIX = "/verify/";

/** Headers every answer of the verification page should carry. */
export const VERIFY_HEADERS: Readonly<Record<string, string>> = {
  "X-Robots-Tag": "noindex, nofollow",
  "Cache-Control": "private, no-store",
};

const LIMITED_PAGE = `<!doctype html>
<html lang="en-GB"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex, nofollow"><title>Too many checks · Benchclear</title></head>
<body style="font-family: system-ui, sans-serif; max-width: 28rem; margin: 2rem auto; padding: 0 1rem; color: #1c1917">
<main id="main"><p style="text-transform: uppercase; letter-spacing: .05em; color: #57534e; font-size: .875rem">Permit status</p>
<h1 style="font-size: 1.875rem; margin: .25rem 0">Too many checks</h1>
<p>This network has checked many permits in a short time. Wait about MINUTES and scan the code again.</p></main>
</body></html>`;

function limitedResponse(retryAfterSeconds: number): Response {
  const minutes = Math.max(1, Math.ceil(retryAfterSeconds / 60));
  return new Response(LIMITED_PAGE.replace("MINUTES", `${minutes} ${minutes === 1 ? "minute" : "minutes"}`), {
    status: 429,
    headers: {
      ...VERIFY_HEADERS,
      "Content-Type": "text/html; charset=utf-8",
      "Retry-After": String(retryAfterSeconds),
    },
  });
}

/** A 429 answer when this client is already over the verification limit, else null (let the page render). */
export async function verifyGate(headers: Headers): Promise<Response | null> {
  const state = await peekVerifyLookup(headers);
  return state.allowed ? null : limitedResponse(state.retryAfterSeconds);
}

// The proxy and the page run in one Node.js process but load separate copies of this module, so the
// proof that the proxy counted a look-up is a random token kept on globalThis: a client cannot send
// it, and a page served without the proxy (or by another process) does not see it and counts itself.
export const COUNTED_HEADER = "x-benchclear-verify-counted";
const tokenHolder = globalThis as unknown as { benchclearVerifyToken?: string };
export function countedToken(): string {
  tokenHolder.benchclearVerifyToken ??= crypto.randomUUID();
  return tokenHolder.benchclearVerifyToken;
}

/**
 * For proxy.ts: counts this look-up (one round trip, instead of a peek here and a hit in the page)
 * and answers 429 over the limit; otherwise gives the request headers that tell the page it was
 * counted.
 */
export async function countAtVerifyGate(
  headers: Headers,
): Promise<{ refused: Response; requestHeaders?: undefined } | { refused: null; requestHeaders: Headers }> {
  const state = await countVerifyLookup(headers);
  if (!state.allowed) return { refused: limitedResponse(state.retryAfterSeconds) };
  return { refused: null, requestHeaders: new Headers({ [COUNTED_HEADER]: countedToken() }) };
}

/** Whether proxy.ts already counted this request's look-up (see countAtVerifyGate). */
export function countedAtGate(headers: Headers): boolean {
  return headers.get(COUNTED_HEADER) === countedToken();
}
