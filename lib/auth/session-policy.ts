// Session lifetimes (ASVS 3.3 / 7.3): a session ends 12 h after sign-in whatever happens, or after
// 60 min without a request. Edge-safe: no imports.
export const SESSION_ABSOLUTE_SECONDS = 12 * 60 * 60;
export const SESSION_IDLE_SECONDS = 60 * 60;

/**
 * How often the session cookie is re-issued to move its "last seen" time on (s). Re-encrypting the
 * cookie on every request cost about a third of a list request's CPU (docs/performance.md), so a
 * request within a minute of the last re-issue keeps the cookie it came with. The idle limit is
 * counted from the last re-issue, so a session can end up to this much *before* 60 min without a
 * request, never after: the limits above still hold.
 */
export const SESSION_REFRESH_SECONDS = 60;

/** The timestamps a session token carries (ms since epoch). */
export type SessionTimes = { signedInAt?: unknown; lastSeen?: unknown };

/**
 * What a session token's times say at `now` (ms since epoch): "ended" past the absolute or the idle
 * limit; "refresh" when its last-seen time is due to move on; "fresh" otherwise.
 */
export function sessionTokenState(token: SessionTimes, now: number): "ended" | "refresh" | "fresh" {
  const signedInAt = typeof token.signedInAt === "number" ? token.signedInAt : 0;
  const lastSeen = typeof token.lastSeen === "number" ? token.lastSeen : 0;
  if (now - signedInAt > SESSION_ABSOLUTE_SECONDS * 1000) return "ended";
  if (now - lastSeen > SESSION_IDLE_SECONDS * 1000) return "ended";
  // A clock that stepped back (lastSeen ahead of now) re-issues too rather than trusting the future.
  if (now - lastSeen >= SESSION_REFRESH_SECONDS * 1000 || now < lastSeen) return "refresh";
  return "fresh";
}
