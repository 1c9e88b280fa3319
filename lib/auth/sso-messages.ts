// Why an institutional sign-in was refused (lib/auth/sso.ts), in the words the sign-in page shows
// (it gets the reason as ?error=…). Browser-safe: no imports.

export type SsoRefusal = "missing_claims" | "disabled" | "unverified_email" | "identity_conflict";

export const SSO_REFUSALS: Record<SsoRefusal, string> = {
  missing_claims:
    "Your institution's sign-in did not say who you are (no subject or e-mail address). Ask its administrators.",
  disabled: "This account is disabled. Ask your institution's Benchclear admin.",
  unverified_email:
    "Your institution's sign-in says your e-mail address is not verified, and an account with it already exists here.",
  identity_conflict: "An account with your e-mail address belongs to another institutional identity. Ask an admin.",
};
