import "server-only";
import type { z } from "zod";
import { env } from "@/lib/env";
import { can, getCurrentUser, type CurrentUser } from "@/lib/auth/guards";
import type { Permission } from "@/lib/auth/permissions";
import { AppError, errorBody, forbidden, fromZodError, unauthenticated } from "./errors";

// Every route handler is built with route(): one order for all of them — same-origin and content-type
// checks for mutations, authenticate (401), permission (403), parse query and body with zod (422
// naming the field), then the handler, which does record-level checks. Errors become JSON answers;
// unexpected errors are logged and answered with a bare 500.

type Access = "public" | "user" | Permission;

type Context<B, Q, A extends Access> = {
  request: Request;
  user: A extends "public" ? CurrentUser | null : CurrentUser;
  body: B;
  query: Q;
  params: Record<string, string>;
};

type Options<B, Q, A extends Access> = {
  access: A;
  body?: z.ZodType<B>;
  query?: z.ZodType<Q>;
  /** Raw body limit in bytes for JSON bodies (default 256 KiB). */
  maxBodyBytes?: number;
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

async function readJson(request: Request, limit: number): Promise<unknown> {
  const type = request.headers.get("content-type") ?? "";
  if (!/^application\/json\b/i.test(type)) {
    throw new AppError("unsupported_media_type", "Send the body as JSON (Content-Type: application/json).");
  }
  const text = await request.text();
  if (Buffer.byteLength(text) > limit)
    throw new AppError("payload_too_large", `The body is larger than ${limit} bytes.`);
  try {
    return text === "" ? undefined : JSON.parse(text);
  } catch {
    throw new AppError("bad_request", "The body is not valid JSON.");
  }
}

export function errorResponse(error: unknown): Response {
  if (error instanceof AppError) {
    const headers: HeadersInit = {};
    if (error.details.retryAfterSeconds) headers["Retry-After"] = String(error.details.retryAfterSeconds);
    return Response.json(errorBody(error), { status: error.status, headers });
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
        if (options.access !== "user" && !can(user, options.access)) throw forbidden();
      }

      const rawParams = (await context?.params) ?? {};
      const params = Object.fromEntries(
        Object.entries(rawParams).map(([k, v]) => [k, Array.isArray(v) ? v.join("/") : v]),
      );

      let query = undefined as Q;
      if (options.query) {
        const url = new URL(request.url);
        const parsed = options.query.safeParse(Object.fromEntries(url.searchParams));
        if (!parsed.success) throw fromZodError(parsed.error);
        query = parsed.data;
      }

      let body = undefined as B;
      if (options.body) {
        const raw = await readJson(request, options.maxBodyBytes ?? 256 * 1024);
        const parsed = options.body.safeParse(raw);
        if (!parsed.success) throw fromZodError(parsed.error);
        body = parsed.data;
      }

      const result = await handler({ request, user: user as Context<B, Q, A>["user"], body, query, params });
      return result instanceof Response ? result : Response.json(result);
    } catch (error) {
      return errorResponse(error);
    }
  };
}
