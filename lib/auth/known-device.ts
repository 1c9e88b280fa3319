import "server-only";
import crypto from "node:crypto";
import { env } from "@/lib/env";

// A "known device" cookie (the OWASP device-cookie scheme for slowing online guessing): after a
// correct sign-in the browser keeps a tag for that account, a MAC of the e-mail under a key derived
// from AUTH_SECRET. A sign-in from a browser carrying the tag for the e-mail it tries is not counted
// against, nor refused by, the per-address limit (lib/ratelimit signInAddress), so someone spraying
// wrong passwords from a campus NAT cannot lock out the people behind it who have signed in before.
// The per-account limit applies to every attempt regardless. A tag proves only that this browser
// once knew the password; it grants nothing by itself.

export const KNOWN_DEVICE_COOKIE = "benchclear-known-device";
/** How long a browser stays known without signing in again: 180 days, in seconds. */
export const KNOWN_DEVICE_MAX_AGE_SECONDS = 180 * 24 * 3600;
/** Tags kept per browser (a shared lab computer, several accounts); oldest dropped first. */
const MAX_TAGS = 4;

function key(): Buffer {
  return Buffer.from(crypto.hkdfSync("sha256", env().AUTH_SECRET, "", "benchclear known-device cookie v1", 32));
}

/** 128 bits of HMAC-SHA256 over the normalised e-mail, base64url. */
export function deviceTag(email: string): string {
  return crypto
    .createHmac("sha256", key())
    .update(email.trim().toLowerCase())
    .digest()
    .subarray(0, 16)
    .toString("base64url");
}

function cookieValue(cookieHeader: string | null): string {
  if (!cookieHeader) return "";
  for (const part of cookieHeader.split(";")) {
    const eq = part.indexOf("=");
    if (eq > 0 && part.slice(0, eq).trim() === KNOWN_DEVICE_COOKIE) return part.slice(eq + 1).trim();
  }
  return "";
}

function tags(cookieHeader: string | null): string[] {
  return cookieValue(cookieHeader)
    .split(".")
    .filter((t) => /^[A-Za-z0-9_-]{22}$/.test(t))
    .slice(0, MAX_TAGS);
}

/** Whether the request's cookies show this browser has signed in to this account before. */
export function isKnownDevice(cookieHeader: string | null, email: string): boolean {
  const want = Buffer.from(deviceTag(email));
  return tags(cookieHeader).some((t) => {
    const have = Buffer.from(t);
    return have.length === want.length && crypto.timingSafeEqual(have, want);
  });
}

/** The cookie value after a correct sign-in to `email`: its tag first, others kept up to the cap. */
export function knownDeviceCookieValue(cookieHeader: string | null, email: string): string {
  const tag = deviceTag(email);
  return [tag, ...tags(cookieHeader).filter((t) => t !== tag)].slice(0, MAX_TAGS).join(".");
}
