import type { MatrixRow } from "../matrix-kit";

// Issue 18, item 2: the committee report (/reports, its PDF and each chart's CSV) for safety officers
// and admins. The responder's column is derived (refused), as on every row that does not name it.

const readers = {
  anonymous: "→/sign-in",
  instructor: "→/forbidden",
  reviewer: "→/forbidden",
  safety_officer: 200,
  admin: 200,
} as const;

export const REPORT_ROWS: MatrixRow[] = [
  { route: "/reports", method: "PAGE", expect: readers },
  { route: "/reports/pdf", method: "GET", expect: readers },
  {
    route: "/api/reports/export.csv",
    method: "GET",
    path: () => "/api/reports/export.csv?chart=issued",
    expect: { anonymous: 401, instructor: 403, reviewer: 403, safety_officer: 200, admin: 200 },
  },
];
