import "server-only";
import { getToken } from "next-auth/jwt";
import { z } from "zod";
import { INSTITUTION_PROVIDER } from "@/auth.config";
import { env } from "@/lib/env";

// Signing out of Benchclear after an institutional sign-in also ends the session at the provider
// (OpenID Connect RP-Initiated Logout 1.0): the browser is sent to the provider's
// end_session_endpoint (from its discovery document) with the ID token it issued as id_token_hint
// and our sign-in page as post_logout_redirect_uri (registered with the provider beside the
// callback). Without that the next "Sign in with …" would pass straight through on the provider's
// own session — on a shared lab computer, as the previous person. Password sessions sign out here
// only. A provider without an end_session_endpoint, or one that cannot be reached, leaves the
// sign-out local (logged; the person is signed out of Benchclear either way).

const discoverySchema = z.object({ end_session_endpoint: z.url({ protocol: /^https?$/ }).optional() });

/** Discovery answers kept per issuer (ms since epoch of the look-up): they change rarely. */
const cache = new Map<string, { endpoint: string | null; at: number }>();
const CACHE_MS = 60 * 60 * 1000; // 1 h
const DISCOVERY_TIMEOUT_MS = 3_000;

async function endSessionEndpoint(issuer: string): Promise<string | null> {
  const hit = cache.get(issuer);
  if (hit && Date.now() - hit.at < CACHE_MS) return hit.endpoint;
  // OpenID Connect Discovery 1.0 §4: the issuer with /.well-known/openid-configuration appended.
  const res = await fetch(`${issuer.replace(/\/$/, "")}/.well-known/openid-configuration`, {
    signal: AbortSignal.timeout(DISCOVERY_TIMEOUT_MS),
    headers: { accept: "application/json" },
  });
  if (!res.ok) throw new Error(`discovery answered ${res.status}`);
  const parsed = discoverySchema.safeParse(await res.json());
  const endpoint = parsed.success ? (parsed.data.end_session_endpoint ?? null) : null;
  cache.set(issuer, { endpoint, at: Date.now() });
  return endpoint;
}

/** Where the provider should send the browser back after signing out there. */
export function postLogoutRedirectUri(appUrl = env().APP_URL): string {
  return new URL("/sign-in", appUrl).toString();
}

/**
 * The provider's sign-out address for the session this request carries, or null: a password
 * session, no ID token kept, no end_session_endpoint, or the provider unreachable.
 */
export async function providerSignOutUrl(request: Request): Promise<string | null> {
  const e = env();
  if (!e.OIDC_ISSUER || !e.OIDC_CLIENT_ID) return null;
  const token = await getToken({
    req: request,
    secret: e.AUTH_SECRET,
    secureCookie: new URL(e.APP_URL).protocol === "https:",
  });
  if (token?.via !== INSTITUTION_PROVIDER || typeof token.idToken !== "string") return null;
  let endpoint: string | null;
  try {
    endpoint = await endSessionEndpoint(e.OIDC_ISSUER);
  } catch (error) {
    console.error("[sso] signing out at the provider skipped:", error instanceof Error ? error.message : error);
    return null;
  }
  if (!endpoint) return null;
  const url = new URL(endpoint);
  url.searchParams.set("id_token_hint", token.idToken);
  url.searchParams.set("post_logout_redirect_uri", postLogoutRedirectUri(e.APP_URL));
  url.searchParams.set("client_id", e.OIDC_CLIENT_ID);
  return url.toString();
}
