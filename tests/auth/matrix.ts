// The authorization matrix, as data: every route handler method and every page × every principal →
// the expected answer (the vocabulary is in matrix-kit.ts). One file of rows per area, so areas grow
// without touching each other's rows. tests/auth/matrix.test.ts runs them.
import { ACCOUNT_ROWS } from "./matrix-rows/accounts";

export type { MatrixRow, Principal, Expectation, MatrixContext } from "./matrix-kit";

export const MATRIX = [...ACCOUNT_ROWS];
