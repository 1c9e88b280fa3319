import { isIP } from "node:net";
import { env } from "@/lib/env";

// The client's address, for rate limits and the audit trail.
//
// Under `npm start` / `npm test` the web server is started with scripts/lib/peer-address.mjs
// preloaded. On every request it writes, into a header whose name is random per process (kept in
// BENCHCLEAR_PEER_HEADER, so no client can send it), the X-Forwarded-For chain as received followed by
// the TCP peer's address. The chain is read from the right: the last entry is the socket, each trusted
// proxy hop vouches for the entry to its left. With TRUSTED_PROXY_HOPS=0 (the default) the socket
// address is the client and every X-Forwarded-For entry a client sends is ignored; with N hops the
// client is the entry N places left of the socket, and anything further left is the client's own say.
//
// Next.js itself only fills X-Forwarded-For when the client sent none (a client-sent one is passed
// through), so without the preload the socket address cannot be told from a forged header: in
// production instrumentation.ts refuses to start without it.

export const PEER_HEADER_ENV = "BENCHCLEAR_PEER_HEADER";

/** The entries of a comma-separated forwarding chain, trimmed, empty ones dropped. */
function entries(value: string | null): string[] {
  if (!value) return [];
  return value
    .split(",")
    .map((p) => p.trim())
    .filter(Boolean);
}

/** `::ffff:192.0.2.1` → `192.0.2.1`; `[2001:db8::1]:443` and `192.0.2.1:80` → the bare address. */
export function normaliseAddress(raw: string): string {
  let a = raw.trim().toLowerCase();
  const bracketed = /^\[([^\]]+)\](?::\d+)?$/.exec(a);
  if (bracketed) a = bracketed[1];
  else if (/^\d{1,3}(\.\d{1,3}){3}:\d+$/.test(a)) a = a.slice(0, a.lastIndexOf(":"));
  const zone = a.indexOf("%");
  if (zone >= 0 && isIP(a.slice(0, zone)) === 6) a = a.slice(0, zone);
  const mapped = /^::ffff:(\d{1,3}(\.\d{1,3}){3})$/.exec(a);
  if (mapped) a = mapped[1];
  return isIP(a) ? a : "unknown";
}

/** Whether the server was started with the peer-address preload (scripts/lib/peer-address.mjs). */
export function peerHeaderInstalled(): boolean {
  return Boolean(process.env[PEER_HEADER_ENV]);
}

/**
 * The client's address. `hops` is how many proxies in front of this server to believe (default: the
 * TRUSTED_PROXY_HOPS setting).
 */
export function clientIp(headers: Headers, hops: number = env().TRUSTED_PROXY_HOPS): string {
  const name = process.env[PEER_HEADER_ENV];
  let chain: string[];
  if (name) {
    chain = entries(headers.get(name));
  } else {
    // No preload (`next dev` without it, or a unit test): the best available is Next's own
    // X-Forwarded-For, which holds the socket address only when the client sent none. Production
    // never gets here (instrumentation.ts).
    chain = entries(headers.get("x-forwarded-for"));
  }
  if (chain.length === 0) return "unknown";
  const index = Math.max(0, chain.length - 1 - Math.max(0, Math.trunc(hops)));
  return normaliseAddress(chain[index]);
}

/**
 * The bucket an address is counted in: an IPv4 address as is, an IPv6 address by its /64 prefix —
 * one site or device is routinely given a whole /64 (RFC 6177 / common practice), so per-address
 * limits keyed by the full IPv6 address would be sidestepped by changing the interface bits.
 */
export function addressBucket(address: string): string {
  if (isIP(address) !== 6) return address;
  const [head, tail = ""] = address.split("::");
  const left = head ? head.split(":") : [];
  const right = tail ? tail.split(":") : [];
  const groups = address.includes("::")
    ? [...left, ...Array(8 - left.length - right.length).fill("0"), ...right]
    : left;
  return (
    groups
      .slice(0, 4)
      .map((g) => parseInt(g || "0", 16).toString(16))
      .join(":") + "::/64"
  );
}
