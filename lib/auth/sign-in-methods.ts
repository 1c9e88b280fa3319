import { env, type Env } from "@/lib/env";

// Which ways of signing in this deployment offers (lib/env.ts validates the combination): e-mail and
// password (PASSWORD_SIGN_IN, on unless turned off), and the institution's OpenID Connect provider
// (OIDC_ISSUER). Read by the sign-in and invitation pages and by every route that takes a password.

export type SignInMethods = {
  password: boolean;
  /** The institution's provider, by the name its button shows; null when not configured. */
  institution: { name: string } | null;
};

export function signInMethods(
  config: Pick<Env, "PASSWORD_SIGN_IN" | "OIDC_ISSUER" | "OIDC_DISPLAY_NAME"> = env(),
): SignInMethods {
  return {
    password: config.PASSWORD_SIGN_IN,
    institution: config.OIDC_ISSUER ? { name: config.OIDC_DISPLAY_NAME } : null,
  };
}

export const PASSWORDS_OFF_MESSAGE =
  "Password sign-in is turned off here: sign in through your institution's account instead.";
