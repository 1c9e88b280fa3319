// Matrix rows of issue 18's items 3 and 4: the tier-threshold preview and search.
import { DEFAULT_RULES } from "@/lib/hazard";
import { adminOnly, type MatrixRow } from "../matrix-kit";

export const RULES_SEARCH_ROWS: MatrixRow[] = [
  {
    route: "/api/admin/rules/preview",
    method: "POST",
    // The defaults under another name: assessed, nothing adopted.
    body: () => ({ rules: { ...DEFAULT_RULES, rulesVersion: "matrix-preview" } }),
    expect: adminOnly(200, 401, 403),
  },
];
