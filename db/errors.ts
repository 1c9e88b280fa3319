// PostgreSQL error codes the domain modules act on. drizzle wraps the driver's error in `cause`.

/** A unique constraint refused the row (SQLSTATE 23505): someone else wrote it first. */
export function isUniqueViolation(error: unknown): boolean {
  const e = error as { code?: string; cause?: { code?: string } };
  return e?.code === "23505" || e?.cause?.code === "23505";
}
