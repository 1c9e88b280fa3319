// Matrix rows of issue 18's items 3 and 4: the tier-threshold preview and search.
import { DEFAULT_RULES } from "@/lib/hazard";
import { adminOnly, everyone, signedIn, type Expectation, type MatrixRow, type Principal } from "../matrix-kit";

/**
 * Every signed-in role that holds "search" gets `ok`; a role without it (the responder of issue 18
 * item 6, when the matrix has that principal) gets `denied`.
 */
const searchers = (ok: Expectation, anonymous: Expectation, denied: Expectation): Record<Principal, Expectation> => ({
  ...signedIn(ok, anonymous),
  ...("responder" in everyone(0) ? { responder: denied } : {}),
});

export const RULES_SEARCH_ROWS: MatrixRow[] = [
  {
    route: "/api/admin/rules/preview",
    method: "POST",
    // The defaults under another name: assessed, nothing adopted.
    body: () => ({ rules: { ...DEFAULT_RULES, rulesVersion: "matrix-preview" } }),
    expect: adminOnly(200, 401, 403),
  },
  { route: "/api/search", method: "GET", path: () => "/api/search?q=bench", expect: searchers(200, 401, 403) },
  {
    route: "/search",
    method: "PAGE",
    path: () => "/search?q=bench",
    expect: searchers(200, "→/sign-in", "→/forbidden"),
  },
];
