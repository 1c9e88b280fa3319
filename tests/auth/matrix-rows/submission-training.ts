import type { MatrixRow } from "../matrix-kit";
import { instructorsDraft } from "./applications";

// Named operators' training on the application form's last step (issue 17): the applicant's own
// draft only. Others who may write applications get the same 404 as for a draft that does not exist;
// an admin, who may not write applications, 403.
export const SUBMISSION_TRAINING_ROWS: MatrixRow[] = [
  {
    route: "/api/applications/[id]/training",
    method: "GET",
    prepare: instructorsDraft,
    path: (c) => `/api/applications/${c.data.applicationId}/training`,
    expect: { anonymous: 401, instructor: 200, reviewer: 404, safety_officer: 404, admin: 403 },
  },
];
