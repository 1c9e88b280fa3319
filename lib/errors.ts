import { ZodError } from "zod";

// One error type for everything a handler refuses on purpose, with a code → status table. The route
// wrapper (lib/http/route.ts) turns these, and zod errors, into JSON answers; anything else is a 500
// with no detail from the database or the stack in the response.

export const ERROR_STATUS = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  unsupported_media_type: 415,
  payload_too_large: 413,
  invalid: 422,
  rate_limited: 429,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

export type FieldIssue = { path: string; message: string };

export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly details: { issues?: FieldIssue[]; retryAfterSeconds?: number } = {},
  ) {
    super(message);
    this.name = "AppError";
  }
  get status(): number {
    return ERROR_STATUS[this.code];
  }
}

export const unauthenticated = () => new AppError("unauthenticated", "Sign in to continue.");
export const forbidden = (message = "You do not have permission to do this.") => new AppError("forbidden", message);
export const notFound = (what = "That record") => new AppError("not_found", `${what} was not found.`);
export const conflict = (message: string) => new AppError("conflict", message);
/** 422 naming one field, shown next to it by the form. */
export const invalidField = (path: string, message: string) =>
  new AppError("invalid", `${path}: ${message}`, { issues: [{ path, message }] });

/** Renders a zod path like ["sources", 0, "capacitance_F"] as "sources[0].capacitance_F". */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = "";
  for (const part of path) {
    if (typeof part === "number") out += `[${part}]`;
    else out += out ? `.${String(part)}` : String(part);
  }
  return out || "(body)";
}

export function fromZodError(error: ZodError, where = ""): AppError {
  const issues = error.issues.map((issue) => ({
    path: formatPath([...(where ? [where] : []), ...issue.path]),
    message: issue.message,
  }));
  const first = issues[0];
  const summary = first ? `${first.path}: ${first.message}` : "The input is not valid.";
  return new AppError("invalid", summary, { issues });
}

export function errorBody(error: AppError) {
  return {
    error: {
      code: error.code,
      message: error.message,
      ...(error.details.issues ? { issues: error.details.issues } : {}),
    },
  };
}

// PostgreSQL out of reach (restarting, failing over, network): the request is answered 503 with
// Retry-After instead of a bare 500, and the pool reconnects by itself once the server is back.
// Recognised by the driver's socket errors and SQLSTATE classes 08 (connection exception) and 57P
// (operator intervention: admin_shutdown, crash_shutdown, cannot_connect_now); drizzle wraps the
// driver's error, so the whole cause chain is looked at.
const UNREACHABLE_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "EPIPE", "ETIMEDOUT", "ENOTCONN", "EHOSTUNREACH"]);
const UNREACHABLE_MESSAGES =
  /Connection terminated|terminating connection due to administrator command|the database system is (starting up|shutting down|in recovery mode)|timeout exceeded when trying to connect|Client has encountered a connection error|Connection ended unexpectedly/i;

/** Seconds a client is asked to wait when the database is out of reach. */
export const DATABASE_RETRY_AFTER_SECONDS = 5;

export function isDatabaseUnavailable(error: unknown): boolean {
  let current: unknown = error;
  for (let depth = 0; current && depth < 6; depth++) {
    const e = current as { code?: unknown; message?: unknown; cause?: unknown };
    const code = typeof e.code === "string" ? e.code : "";
    if (UNREACHABLE_CODES.has(code) || code.startsWith("08") || /^57P0[123]$/.test(code)) return true;
    if (typeof e.message === "string" && UNREACHABLE_MESSAGES.test(e.message)) return true;
    current = e.cause;
  }
  return false;
}

export const databaseUnavailable = () =>
  new AppError("unavailable", "The database is out of reach for a moment. Try again in a few seconds.", {
    retryAfterSeconds: DATABASE_RETRY_AFTER_SECONDS,
  });
