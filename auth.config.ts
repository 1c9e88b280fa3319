import type { NextAuthConfig } from "next-auth";
import { SESSION_ABSOLUTE_SECONDS, sessionTokenState } from "@/lib/auth/session-policy";

// The part of the Auth.js configuration that proxy.ts can load: no database, no argon2. The JWT
// carries only the user's id, the session version it was issued under and two timestamps; roles,
// name and the disabled flag are read from the database on every request (lib/auth/guards.ts).

/**
 * The request header proxy.ts sets to the path and query a page request asked for (overwriting any
 * the client sent); requirePageUser sends a refused visitor to /sign-in with it as `from`.
 */
export const ASKED_PATH_HEADER = "x-benchclear-asked-path";

/** The id of the institution's OpenID Connect provider in Auth.js (its callback path ends in it). */
export const INSTITUTION_PROVIDER = "institution";

declare module "next-auth" {
  interface Session {
    user: { id: string };
    sv?: number;
    /** When the person last signed in at the institution's provider (ms since epoch). */
    authAt?: number;
  }
  interface User {
    sessionVersion?: number;
  }
}

declare module "@auth/core/jwt" {
  interface JWT {
    sv?: number;
    signedInAt?: number; // ms since epoch
    lastSeen?: number; // ms since epoch
    authAt?: number; // ms since epoch: the provider's auth_time, for institutional sign-ins
    via?: string; // "institution" for institutional sign-ins
    /** The provider's ID token, kept (encrypted in the session cookie) as the id_token_hint of signing out there. */
    idToken?: string;
  }
}

export const authConfig = {
  trustHost: true,
  pages: { signIn: "/sign-in", error: "/sign-in" },
  session: { strategy: "jwt", maxAge: SESSION_ABSOLUTE_SECONDS, updateAge: 0 },
  providers: [],
  callbacks: {
    jwt({ token, user }) {
      const now = Date.now();
      if (user) {
        token.sub = user.id;
        token.sv = user.sessionVersion ?? 1;
        token.signedInAt = now;
        token.lastSeen = now;
        return token;
      }
      // Past the absolute or idle limit: Auth.js clears the cookie. Otherwise Auth.js re-issues the
      // cookie (it always does when it runs), so its last-seen time moves on. proxy.ts runs Auth.js
      // only when that is due, at most once a minute (lib/auth/session-cookie.ts).
      if (sessionTokenState(token, now) === "ended") return null;
      token.lastSeen = now;
      return token;
    },
    session({ session, token }) {
      return { ...session, user: { id: token.sub ?? "" }, sv: token.sv, authAt: token.authAt } as typeof session;
    },
  },
} satisfies NextAuthConfig;
