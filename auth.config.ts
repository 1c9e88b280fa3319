import type { NextAuthConfig } from "next-auth";
import { SESSION_ABSOLUTE_SECONDS, SESSION_IDLE_SECONDS } from "@/lib/auth/session-policy";

// The part of the Auth.js configuration that proxy.ts can load: no database, no argon2. The JWT
// carries only the user's id, the session version it was issued under and two timestamps; roles,
// name and the disabled flag are read from the database on every request (lib/auth/guards.ts).

declare module "next-auth" {
  interface Session {
    user: { id: string };
    sv?: number;
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
  }
}

export const authConfig = {
  trustHost: true,
  pages: { signIn: "/sign-in" },
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
      const signedInAt = token.signedInAt ?? 0;
      const lastSeen = token.lastSeen ?? 0;
      if (now - signedInAt > SESSION_ABSOLUTE_SECONDS * 1000) return null;
      if (now - lastSeen > SESSION_IDLE_SECONDS * 1000) return null;
      token.lastSeen = now;
      return token;
    },
    session({ session, token }) {
      return { ...session, user: { id: token.sub ?? "" }, sv: token.sv } as typeof session;
    },
  },
} satisfies NextAuthConfig;
