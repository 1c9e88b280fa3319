import NextAuth, { CredentialsSignin } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { z } from "zod";
import { authConfig } from "./auth.config";
import { checkCredentials } from "@/lib/auth/credentials";
import { isKnownDevice } from "@/lib/auth/known-device";
import { clientIp } from "@/lib/http/client-ip";

// The full Auth.js set-up: the Credentials provider checks e-mail and password (with throttling)
// against PostgreSQL. There is no /api/auth/[...nextauth] route: signing in goes through
// POST /api/session, which answers 429 with Retry-After, then calls signIn() on the server.

export class ThrottledSignin extends CredentialsSignin {
  code = "throttled";
  constructor(readonly retryAfterSeconds: number) {
    super();
  }
}

const credentialsSchema = z.object({ email: z.string().max(320), password: z.string().max(1024) });

export const { auth, signIn, signOut } = NextAuth({
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
  ],
});
