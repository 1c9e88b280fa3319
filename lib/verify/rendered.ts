import "server-only";
import { countedToken, COUNTED_HEADER } from "./gate";
import { findPublicPermit, type PublicPermit } from "./queries";

// The status page's HTML, kept per code and per exact content, for proxy.ts.
//
// Rendering /verify/[code] with React and the Next.js runtime cost about 35 ms of CPU a request on a
// quiet machine, against 2.5 ms for a bare server running the same SQL (docs/performance.md). What
// the page shows is the permit's row and its signatures, read live from the database on every
// look-up (one statement; the seals' verdict is kept ≤ 60 s, lib/verify/queries.ts). So proxy.ts
// reads the permit itself, and when this process already rendered the page for exactly that content
// (the code, every field the page prints, the institution's day, the seals' verdict) it answers with
// that HTML, under a fresh CSP nonce. Any change the page would show — a revocation, a suspension, a
// new signature, the day passing the permit's last day, a change made straight in the database —
// changes the content, so it is rendered again on that very request: nothing to invalidate, and no
// look-up ever shows an older status than the database holds.
//
// A miss renders the real page once: proxy.ts fetches it from this same server over loopback, with
// the content it read (so the page does not read it again) and this process's random token (so the
// look-up is not counted twice and a client cannot send content of its own). Only a plain GET of
// the page's HTML is served from here; the client router's RSC requests, queries and HEAD go through
// the page as before.

/** Request header carrying the looked-up content to the page; trusted only with COUNTED_HEADER's token. */
export const OUTCOME_HEADER = "x-benchclear-verify-outcome";

/** What a look-up found: the page's whole content. */
export type Found = { kind: "unknown" } | { kind: "found"; permit: PublicPermit };

/** A rendered page as the bytes between the places its nonce goes. */
type Rendered = { parts: Buffer[]; contentType: string; vary: string | null };

/** Pages kept: at ~20 kB each (1,000 permits' pages ≈ 20 MB) the working set of a busy open day. */
const MAX_PAGES = 1_000;
const pages = new Map<string, Rendered>();
const rendering = new Map<string, Promise<Rendered | null>>();

/** The permit behind a code as the page shows it (no counting: proxy.ts counted already). */
export async function lookUpForPage(code: string): Promise<Found> {
  const permit = await findPublicPermit(code);
  return permit ? { kind: "found", permit } : { kind: "unknown" };
}

/** For the page: the content proxy.ts read for this request, or null when it did not hand one over. */
export function outcomeFromProxy(headers: Headers): Found | null {
  const value = headers.get(OUTCOME_HEADER);
  if (!value || headers.get(COUNTED_HEADER) !== countedToken()) return null;
  return JSON.parse(Buffer.from(value, "base64url").toString("utf8")) as Found;
}

/** Headers for the page's request that hand it this content (with the token proving proxy.ts sent them). */
export function outcomeHeaders(outcome: Found): Record<string, string> {
  return {
    [COUNTED_HEADER]: countedToken(),
    [OUTCOME_HEADER]: Buffer.from(JSON.stringify(outcome), "utf8").toString("base64url"),
  };
}

/** Whether a request is proxy.ts's own render of a page (see renderOnce). */
export function isOwnRender(headers: Headers): boolean {
  return headers.has(OUTCOME_HEADER) && headers.get(COUNTED_HEADER) === countedToken();
}

/** The one code a /verify/<code> path names, or null for anything else (nested paths, bad escapes). */
export function codeOfPath(pathname: string, prefix: string): string | null {
  const rest = pathname.slice(prefix.length);
  if (!rest || rest.includes("/")) return null;
  try {
    return decodeURIComponent(rest);
  } catch {
    return null;
  }
}

/** A browser's plain load of the page's HTML: the only request answered from kept pages. */
export function servesKeptPage(request: Request & { nextUrl: URL }): boolean {
  if (request.method !== "GET" || request.nextUrl.search) return false;
  const h = request.headers;
  return !h.has("rsc") && !h.has("next-router-prefetch") && !h.has("next-router-state-tree") && !h.has("next-action");
}

// The server's own address (next start sets it when it listens); a server started otherwise keeps
// nothing and every look-up renders the page as before.
function ownOrigin(): string | null {
  return process.env.__NEXT_PRIVATE_ORIGIN || null;
}

async function renderOnce(pathname: string, outcome: Found): Promise<Rendered | null> {
  const origin = ownOrigin();
  if (!origin) return null;
  try {
    const res = await fetch(new URL(pathname, origin), {
      headers: { ...outcomeHeaders(outcome), accept: "text/html" },
      cache: "no-store",
      redirect: "manual",
    });
    const html = await res.text();
    const nonce = /'nonce-([^']+)'/.exec(res.headers.get("content-security-policy") ?? "")?.[1];
    const contentType = res.headers.get("content-type") ?? "";
    if (res.status !== 200 || !nonce || !contentType.startsWith("text/html")) return null;
    return {
      parts: html.split(nonce).map((part) => Buffer.from(part, "utf8")),
      contentType,
      vary: res.headers.get("vary"),
    };
  } catch {
    return null;
  }
}

/**
 * The page's HTML for this code and content under `nonce`, from the kept pages or rendered once now
 * (concurrent look-ups of the same content share one render); null when it cannot be rendered here
 * (the caller lets the page render as usual).
 */
export async function keptPage(pathname: string, code: string, outcome: Found, nonce: string) {
  const key = `${code}\n${JSON.stringify(outcome)}`;
  let page = pages.get(key);
  if (!page) {
    let pending = rendering.get(key);
    if (!pending) {
      pending = renderOnce(pathname, outcome).finally(() => rendering.delete(key));
      rendering.set(key, pending);
    }
    const rendered = await pending;
    if (!rendered) return null;
    page = rendered;
    // Oldest first out; a page of a permit whose content moved on is never asked for again and ages out.
    if (!pages.has(key)) {
      if (pages.size >= MAX_PAGES) pages.delete(pages.keys().next().value!);
      pages.set(key, page);
    }
  }
  // The nonce the page was rendered with appears only where Next.js put it (script and link tags);
  // each answer gets its own, as a render would. Kept as bytes: no 25 kB of text to encode each time.
  const nonceBytes = Buffer.from(nonce, "utf8");
  const body = Buffer.concat(page.parts.flatMap((part, i) => (i === 0 ? [part] : [nonceBytes, part])));
  return { body, contentType: page.contentType, vary: page.vary };
}
