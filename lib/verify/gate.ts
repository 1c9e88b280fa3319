import "server-only";
import { peekVerifyLookup } from "./limit";

// For proxy.ts, in front of /verify/[code]: an App Router page cannot choose its HTTP status or add
// response headers, so the proxy answers a client already over the limit with a real 429 (and
// Retry-After) before the page renders, and marks every verification answer noindex. The page still
// counts each look-up and refuses on its own (lib/verify/index.ts), so the limit holds without the
// proxy; the proxy only peeks, so no look-up is counted twice.

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

/** A 429 answer when this client is already over the verification limit, else null (let the page render). */
export async function verifyGate(headers: Headers): Promise<Response | null> {
  const state = await peekVerifyLookup(headers);
  if (state.allowed) return null;
  const minutes = Math.max(1, Math.ceil(state.retryAfterSeconds / 60));
  return new Response(LIMITED_PAGE.replace("MINUTES", `${minutes} ${minutes === 1 ? "minute" : "minutes"}`), {
    status: 429,
    headers: {
      ...VERIFY_HEADERS,
      "Content-Type": "text/html; charset=utf-8",
      "Retry-After": String(state.retryAfterSeconds),
    },
  });
}
