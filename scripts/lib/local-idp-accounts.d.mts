// Types for scripts/lib/local-idp-accounts.mjs, for the TypeScript tests.
export type LocalIdpAccount = {
  sub: string;
  login: string;
  name: string;
  email: string;
  department: string;
  groups: string[];
};
export const LOCAL_IDP_PASSWORD: string;
export const LOCAL_IDP_ACCOUNTS: LocalIdpAccount[];
