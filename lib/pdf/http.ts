import "server-only";
import { z } from "zod";
import { AppError, notFound } from "@/lib/errors";
import { isRecordId } from "@/lib/http/ids";
import { can, type CurrentUser } from "@/lib/auth/guards";
import { getPermitDocumentFor } from "./store";
import type { DocumentKind, PaperSize } from "./types";

// The two download routes (/permits/[id]/pdf and /permits/[id]/bench-card) share this: the query,
// the sign-in redirect for a browser that lost its session, and the response headers.

export const documentQuerySchema = z.strictObject({
  size: z.enum(["a4", "letter"], { error: 'Choose the paper size "a4" or "letter".' }).default("a4"),
});

/**
 * These are links people open in the browser, so a visitor without a valid session (signed out, or a
 * disabled account whose token is still valid) is sent to sign in, as proxy.ts does for pages.
 */
export function signInRedirect(request: Request): Response {
  const url = new URL(request.url);
  const target = new URL("/sign-in", url);
  target.searchParams.set("from", url.pathname + url.search);
  return new Response(null, { status: 307, headers: { Location: target.pathname + target.search } });
}

/** The 403 page, for a browser link opened by an account that may not use it. */
export function forbiddenRedirect(): Response {
  return new Response(null, { status: 307, headers: { Location: "/forbidden" } });
}

export async function permitDocumentResponse(input: {
  user: CurrentUser;
  permitId: string | undefined;
  kind: DocumentKind;
  size: PaperSize;
}): Promise<Response> {
  // A responder's account sees the live sheet only, not permits (lib/auth/permissions.ts).
  if (!can(input.user, "workspace.use")) return forbiddenRedirect();
  if (!input.permitId || !isRecordId(input.permitId)) throw notFound("That permit");
  const file = await getPermitDocumentFor(input.user, input.permitId, { kind: input.kind, size: input.size });
  if (!/^[A-Za-z0-9._-]+$/.test(file.filename))
    throw new AppError("bad_request", "The permit has no printable file name.");
  return new Response(new Uint8Array(file.bytes), {
    status: 200,
    headers: {
      "Content-Type": "application/pdf",
      "Content-Length": String(file.bytes.length),
      "Content-Disposition": `attachment; filename="${file.filename}"`,
      "X-Content-Type-Options": "nosniff",
      // Private to the signed-in user, and a revocation must reach the next download.
      "Cache-Control": "private, no-store",
    },
  });
}
