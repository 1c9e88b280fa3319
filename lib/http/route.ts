import "server-only";
import type { z } from "zod";
import { env } from "@/lib/env";
import { can, getCurrentUser, type CurrentUser } from "@/lib/auth/guards";
import type { Permission } from "@/lib/auth/permissions";
import { isRecordId } from "./ids";
import { DEFAULT_BODY_LIMIT_BYTES, discardBody, readBodyBytes, readJsonBody } from "./body";
import {
  AppError,
  databaseUnavailable,
  errorBody,
  forbidden,
  fromZodError,
  isDatabaseUnavailable,
  notFound,
  unauthenticated,
} from "@/lib/errors";

// Every route handler is built with route(): one order for all of them — same-origin and content-type
// checks for mutations, authenticate (401), permission (403), parse query and body with zod (422
// naming the field), then the handler, which does record-level checks. Every body is read through
// lib/http/body.ts, counted as it streams and cut at the route's limit (413): a JSON body when the
// route declares `body`, raw bytes when it declares `rawBody` (uploads), and otherwise a small
// allowance read and dropped. Errors become JSON answers;
// unexpected errors are logged and answered with a bare 500.

type Access = "public" | "user" | Permission;

type Context<B, Q, A extends Access> = {
  request: Request;
  user: A extends "public" ? CurrentUser | null : CurrentUser;
  body: B;
  /** Reads the raw body through the bounded reader, when the route declared `rawBody` (uploads). */
  readRawBody: () => Promise<Buffer>;
  query: Q;
  params: Record<string, string>;
};

type Options<B, Q, A extends Access> = {
  access: A;
  body?: z.ZodType<B>;
  query?: z.ZodType<Q>;
  /** Raw body limit in bytes for JSON bodies (default 256 KiB). */
  maxBodyBytes?: number;
  /**
   * Path params that are record ids, each with what it names ("That permit"): checked as UUIDs
   * before the body is read. Anything else names no record, so it gets the same 404 as a record
   * that does not exist (one status for a bad id across the API).
   */
  ids?: Record<string, string>;
  /** The route reads the body itself (uploads), through ctx.readRawBody(): at most this many bytes. */
  rawBody?: { maxBytes: number; tooLarge?: () => AppError };
};

const MUTATING = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/** Refuses cross-site mutations: Origin must be ours, or the browser must say same-origin. */
export function assertSameOrigin(request: Request): void {
  const site = request.headers.get("sec-fetch-site");
  if (site === "same-origin") return;
  const origin = request.headers.get("origin");
  if (!origin) throw new AppError("forbidden", "Cross-site request refused: the Origin header is missing.");
  const allowed = new Set<string>([new URL(env().APP_URL).origin]);
  const host = request.headers.get("host");
  if (host) {
    allowed.add(`http://${host}`);
    allowed.add(`https://${host}`);
  }
  if (!allowed.has(origin)) throw new AppError("forbidden", "Cross-site request refused.");
}

export function errorResponse(error: unknown): Response {
  if (error instanceof AppError) {
    const headers: HeadersInit = {};
    if (error.details.retryAfterSeconds) headers["Retry-After"] = String(error.details.retryAfterSeconds);
    return Response.json(errorBody(error), { status: error.status, headers });
  }
  if (isDatabaseUnavailable(error)) {
    console.error("[route] database unavailable:", error instanceof Error ? error.message : error);
    return errorResponse(databaseUnavailable());
  }
  console.error("[route] unexpected error:", error);
  return Response.json({ error: { code: "internal", message: "Something went wrong on our side." } }, { status: 500 });
}

export function route<B = undefined, Q = undefined, A extends Access = Access>(
  options: Options<B, Q, A>,
  handler: (ctx: Context<B, Q, A>) => Promise<Response | object>,
) {
  return async (request: Request, context?: { params?: Promise<Record<string, string | string[]>> }) => {
    try {
      const mutating = MUTATING.has(request.method);
      if (mutating) assertSameOrigin(request);

      const user = await getCurrentUser();
      if (options.access !== "public") {
        if (!user) throw unauthenticated();
        // "user" is any account that may use the workspace: not a responder's, which sees the live
        // sheet only (lib/auth/permissions.ts).
        if (!can(user, options.access === "user" ? "workspace.use" : options.access)) throw forbidden();
      }

      const rawParams = (await context?.params) ?? {};
      const params = Object.fromEntries(
        Object.entries(rawParams).map(([k, v]) => [k, Array.isArray(v) ? v.join("/") : v]),
      );

      for (const [name, what] of Object.entries(options.ids ?? {})) {
        if (!isRecordId(params[name])) throw notFound(what);
      }

      let query = undefined as Q;
      if (options.query) {
        const url = new URL(request.url);
        const parsed = options.query.safeParse(Object.fromEntries(url.searchParams));
        if (!parsed.success) throw fromZodError(parsed.error);
        query = parsed.data;
      }

      let body = undefined as B;
      const rawOptions = options.rawBody;
      // Uploads read their body after their own record checks (404 before 415 before reading).
      const readRawBody = rawOptions
        ? () => readBodyBytes(request, rawOptions.maxBytes, rawOptions.tooLarge)
        : () => Promise.reject(new Error("this route declared no rawBody"));
      if (options.body) {
        const raw = await readJsonBody(request, options.maxBodyBytes ?? DEFAULT_BODY_LIMIT_BYTES);
        const parsed = options.body.safeParse(raw);
        if (!parsed.success) throw fromZodError(parsed.error);
        body = parsed.data;
      } else if (!rawOptions && request.body) {
        await discardBody(request);
      }

      const result = await handler({
        request,
        user: user as Context<B, Q, A>["user"],
        body,
        readRawBody,
        query,
        params,
      });
      return result instanceof Response ? result : Response.json(result);
    } catch (error) {
      return errorResponse(error);
    }
  };
}
