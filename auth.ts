import { Auth } from "@auth/core";
import NextAuth, { CredentialsSignin, type NextAuthConfig } from "next-auth";
import type { OIDCConfig } from "next-auth/providers";
import Credentials from "next-auth/providers/credentials";
import { z } from "zod";
import { authConfig, INSTITUTION_PROVIDER } from "./auth.config";
import { checkCredentials } from "@/lib/auth/credentials";
import { isKnownDevice } from "@/lib/auth/known-device";
import { ssoAccount, signInWithProvider, type SsoClaims } from "@/lib/auth/sso";
import { env, type Env } from "@/lib/env";
import { clientIp } from "@/lib/http/client-ip";

// The full Auth.js set-up. The Credentials provider checks e-mail and password (with throttling)
// against PostgreSQL: signing in goes through POST /api/session, which answers 429 with Retry-After,
// then calls signIn() on the server. With OIDC_ISSUER set, the institution's OpenID Connect provider
// signs people in too (authorization code with PKCE, state and nonce): POST /api/session/institution
// starts it, and the provider returns to GET /api/auth/callback/institution, the one Auth.js
// endpoint served (app/api/auth/[...nextauth]/route.ts). The configuration is built on first use,
// so `next build` needs no environment.

export class ThrottledSignin extends CredentialsSignin {
  code = "throttled";
  constructor(readonly retryAfterSeconds: number) {
    super();
  }
}

const credentialsSchema = z.object({ email: z.string().max(320), password: z.string().max(1024) });

/** The validated ID token's claims under the UserInfo answer (UserInfo wins: it is asked for fresh). */
function claimsOf(account: { id_token?: string } | null | undefined, profile: unknown): SsoClaims {
  // Auth.js has validated this token already (signature, issuer, audience, expiry, nonce): read it.
  const payload = account?.id_token?.split(".")[1];
  const idClaims = payload ? (JSON.parse(Buffer.from(payload, "base64url").toString("utf8")) as SsoClaims) : {};
  return { ...idClaims, ...((profile as SsoClaims | undefined) ?? {}) };
}

function institutionProvider(e: Env): OIDCConfig<SsoClaims> | null {
  if (!e.OIDC_ISSUER || !e.OIDC_CLIENT_ID || !e.OIDC_CLIENT_SECRET) return null;
  return {
    id: INSTITUTION_PROVIDER,
    name: e.OIDC_DISPLAY_NAME,
    type: "oidc",
    issuer: e.OIDC_ISSUER,
    clientId: e.OIDC_CLIENT_ID,
    clientSecret: e.OIDC_CLIENT_SECRET,
    checks: ["pkce", "state", "nonce"],
    authorization: { params: { scope: e.OIDC_SCOPES } },
    // Ask UserInfo as well: many providers release department and group claims only there. The ID
    // token is still required and validated (signature, issuer, audience, nonce).
    idToken: false,
    // The account is resolved in the signIn callback (lib/auth/sso.ts); this is only Auth.js's view.
    profile: (claims) => ({
      id: String(claims.sub),
      email: String(claims.email ?? ""),
      name: String(claims.name ?? ""),
    }),
  };
}

let built: NextAuthConfig | undefined;

function config(): NextAuthConfig {
  if (built) return built;
  const e = env();
  // Auth.js builds its own addresses (the OIDC redirect URI, its redirects) from AUTH_URL: the
  // public address, as everywhere else in the app.
  process.env.AUTH_URL ??= e.APP_URL;
  const institution = institutionProvider(e);
  built = {
    ...authConfig,
    logger: {
      // A wrong password is an answer, not an error: keep it out of the server log.
      error(error) {
        if (error instanceof CredentialsSignin || error.name === "CredentialsSignin") return;
        console.error("[auth]", error);
      },
    },
    providers: [
      Credentials({
        credentials: { email: {}, password: {} },
        async authorize(raw, request) {
          const parsed = credentialsSchema.safeParse(raw);
          if (!parsed.success) return null;
          const result = await checkCredentials(parsed.data.email, parsed.data.password, {
            ip: clientIp(request.headers),
            knownDevice: isKnownDevice(request.headers.get("cookie"), parsed.data.email),
          });
          if (result.ok) return result.user;
          if (result.reason === "throttled") throw new ThrottledSignin(result.retryAfterSeconds);
          return null;
        },
      }),
      ...(institution ? [institution] : []),
    ],
    callbacks: {
      ...authConfig.callbacks,
      async signIn({ account, profile }) {
        if (account?.provider !== INSTITUTION_PROVIDER) return true;
        const result = await signInWithProvider(e.OIDC_ISSUER!, claimsOf(account, profile));
        return result.ok ? true : `/sign-in?error=${result.reason}`;
      },
      async jwt(params) {
        const { account, profile } = params;
        if (account?.provider !== INSTITUTION_PROVIDER || !params.user) return authConfig.callbacks.jwt(params);
        // The Benchclear account the signIn callback found or made for this identity.
        const claims = claimsOf(account, profile);
        const found = await ssoAccount(e.OIDC_ISSUER!, String(claims.sub));
        if (!found) return null;
        const token = authConfig.callbacks.jwt({ ...params, user: { ...params.user, ...found } });
        if (!token) return null;
        // When the person last proved who they are at the provider (OIDC Core 1.0 §2 auth_time, in
        // seconds): signing a decision needs a recent one (lib/signing/password.ts).
        const authTime = typeof claims.auth_time === "number" ? claims.auth_time * 1000 : Date.now();
        token.authAt = Math.min(authTime, Date.now());
        token.via = INSTITUTION_PROVIDER;
        // For RP-initiated logout (lib/auth/sso-logout.ts); the cookie is encrypted (JWE), never read by scripts.
        if (typeof account.id_token === "string" && account.id_token.length <= 4096) token.idToken = account.id_token;
        return token;
      },
    },
  };
  return built;
}

export const { auth, signIn, signOut } = NextAuth(() => config());

/**
 * Handles the provider's return (GET /api/auth/callback/institution) with Auth.js's own handler, on a
 * plain Request at the public address. Not next-auth's `handlers`: they re-wrap the request as a
 * NextRequest, which spells a loopback address (127.0.0.1) as "localhost", so on the local demo and
 * in tests the redirect URI sent when redeeming the code would differ from the one the sign-in
 * started with (RFC 6749 §4.1.3 requires them equal) and the provider would refuse the code.
 */
export async function institutionCallback(request: Request): Promise<Response> {
  const base = config();
  return Auth(request, { ...base, basePath: "/api/auth", secret: env().AUTH_SECRET });
}
