// The demo accounts of the local demo (db/seed.ts): fictional people at the fictional Aldermere
// Institute of Technology, under the reserved `.test` domain (RFC 2606), with a password printed in
// the README. Under NODE_ENV=production they may sign in only on the local demo
// (BENCHCLEAR_LOCAL_DEMO, which lib/env.ts allows only with a loopback APP_URL): an account with a
// published password must never open a real deployment.

export const DEMO_PASSWORD = "benchclear-demo-2026";
export const DEMO_EMAIL_DOMAIN = "benchclear.test";

/** A demo account: by its e-mail domain, or by the published demo password whatever the address. */
export function isDemoAccount(email: string, password: string): boolean {
  return email.trim().toLowerCase().endsWith(`@${DEMO_EMAIL_DOMAIN}`) || password === DEMO_PASSWORD;
}

/** Whether the running configuration refuses demo accounts. */
export function demoAccountsRefused(config: { NODE_ENV: string; BENCHCLEAR_LOCAL_DEMO: boolean }): boolean {
  return config.NODE_ENV === "production" && !config.BENCHCLEAR_LOCAL_DEMO;
}
