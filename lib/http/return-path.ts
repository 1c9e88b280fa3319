// Where to send someone after they sign in. The raw value comes from the address bar or the request
// body, so it is resolved the way a browser resolves a link (WHATWG URL: tabs and newlines dropped,
// `\` read as `/`, `//host` and `https:` leave the site) against a stand-in origin, and only the path
// and query are kept — and only when the result is still on that origin. Anything else becomes "/".
// No server-only import: the sign-in form uses the same rule through lib/auth/schemas.ts.

/** A host name nobody can own (RFC 6761 `.invalid`): what "our origin" is while resolving. */
const STAND_IN_ORIGIN = "https://benchclear.invalid";

export function safeReturnPath(raw: string | null | undefined): string {
  if (typeof raw !== "string" || raw === "" || raw.length > 2000) return "/";
  // Only a path can be a return target; a scheme or anything the URL parser would read as one is out.
  if (!raw.startsWith("/")) return "/";
  let url: URL;
  try {
    url = new URL(raw, STAND_IN_ORIGIN + "/");
  } catch {
    return "/";
  }
  if (url.origin !== STAND_IN_ORIGIN || url.username || url.password) return "/";
  // "/.//x" resolves to the path "//x", which a browser would read as another host: one leading slash.
  const path = "/" + url.pathname.replace(/^[/\\]+/, "");
  const result = path + url.search;
  // Belt and braces: what we hand back must read as a path on this site when parsed again.
  const again = new URL(result, STAND_IN_ORIGIN + "/");
  if (again.origin !== STAND_IN_ORIGIN || !result.startsWith("/") || /^\/[/\\]/.test(result)) return "/";
  return result;
}
