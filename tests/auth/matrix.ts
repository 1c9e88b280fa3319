// The authorization matrix, as data: every route handler method and every page × every principal →
// the expected answer (the vocabulary is in matrix-kit.ts). One file of rows per area, so areas grow
// without touching each other's rows. tests/auth/matrix.test.ts runs them.
import { ACCOUNT_ROWS } from "./matrix-rows/accounts";
import { APPLICATION_ROWS } from "./matrix-rows/applications";
import { INSTITUTION_ROWS } from "./matrix-rows/institution";
import { INCIDENT_ROWS } from "./matrix-rows/incidents";
import { LIVE_REPORT_ROWS } from "./matrix-rows/live-reports";
import { MAIL_ROWS } from "./matrix-rows/mail";
import { OPERATIONS_ROWS } from "./matrix-rows/operations";
import { PDF_VERIFY_ROWS } from "./matrix-rows/pdf-verify";
import { PRE_USE_CHECK_ROWS } from "./matrix-rows/pre-use-checks";
import { REPORT_ROWS } from "./matrix-rows/reports";
import { REVIEW_ROWS } from "./matrix-rows/review";
import { UPKEEP_ROWS } from "./matrix-rows/upkeep";
import { REREVIEW_ROWS } from "./matrix-rows/rereview";
import { RULES_SEARCH_ROWS } from "./matrix-rows/rules-search";
import { TRAINING_ROWS } from "./matrix-rows/training";
import { EXPORT_ROWS } from "./matrix-rows/exports";
import { SUBMISSION_TRAINING_ROWS } from "./matrix-rows/submission-training";

export type { MatrixRow, Principal, Expectation, MatrixContext } from "./matrix-kit";

export const MATRIX = [
  ...ACCOUNT_ROWS,
  ...APPLICATION_ROWS,
  ...INSTITUTION_ROWS,
  ...INCIDENT_ROWS,
  ...MAIL_ROWS,
  ...OPERATIONS_ROWS,
  ...PDF_VERIFY_ROWS,
  ...PRE_USE_CHECK_ROWS,
  ...REVIEW_ROWS,
  ...UPKEEP_ROWS,
  ...REREVIEW_ROWS,
  ...RULES_SEARCH_ROWS,
  ...TRAINING_ROWS,
  ...EXPORT_ROWS,
  ...SUBMISSION_TRAINING_ROWS,
  ...LIVE_REPORT_ROWS,
  ...REPORT_ROWS,
];
