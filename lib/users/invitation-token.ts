import "server-only";
import crypto from "node:crypto";
import { env } from "@/lib/env";

// An invitation's link token is derived from the invitation's id with a key from the environment
// (HMAC-SHA256 under a key derived from AUTH_SECRET): 256 bits nobody can compute without the key. So
// nothing secret has to be stored for the mail — the outbox row keeps the invitation's id, and the
// link is rebuilt whenever the mail is rendered (first send, retries) — while the database keeps only
// the token's SHA-256 (invitations.token_hash) to recognise it. Rotating AUTH_SECRET voids open
// invitations, as it ends sessions.

function key(): Buffer {
  return Buffer.from(crypto.hkdfSync("sha256", env().AUTH_SECRET, "", "benchclear invitation token v1", 32));
}

export function invitationToken(invitationId: string): string {
  return crypto.createHmac("sha256", key()).update(invitationId).digest("base64url"); // 43 characters
}

export function invitationUrl(token: string): string {
  return new URL(`/invite/${token}`, env().APP_URL).toString();
}
