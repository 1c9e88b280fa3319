import { everyone, type MatrixRow } from "../matrix-kit";

// Institutional sign-in (OpenID Connect through the local identity provider, which `npm test` runs).
export const INSTITUTION_ROWS: MatrixRow[] = [
  // Starting a sign-in is open to anyone: the answer is the provider's address, and the state, PKCE
  // and nonce cookies that bind the return to this browser.
  { route: "/api/session/institution", method: "POST", body: () => ({ from: "/" }), expect: everyone(200) },
  // The provider's return without a code or the state cookie is refused back to the sign-in page, whoever
  // asks; every other Auth.js path answers 404 (tests/auth/institution-sign-in.test.ts).
  {
    route: "/api/auth/[...nextauth]",
    method: "GET",
    path: () => "/api/auth/callback/institution",
    expect: everyone("→/sign-in"),
  },
];
