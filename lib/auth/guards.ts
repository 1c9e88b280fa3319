import "server-only";
import { eq } from "drizzle-orm";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { cache } from "react";
import { auth } from "@/auth";
import { ASKED_PATH_HEADER } from "@/auth.config";
import { db } from "@/db";
import { users } from "@/db/schema";
import { AppError, forbidden, unauthenticated } from "@/lib/errors";
import { currentUserColumns, type CurrentUser } from "./current-user";
import { rolesHave, type Permission } from "./permissions";
import { sessionFromProxy, type RequestSession } from "./request-session";

// The data-access gate. Every route handler, server action and server component that reads or
// writes data calls one of these. proxy.ts only redirects signed-out visitors and is never relied on.

export type { CurrentUser };

/**
 * This request's session, read once: what proxy.ts read with Auth.js (lib/auth/request-session.ts),
 * or, for a request the proxy did not see, Auth.js reading the cookie here.
 */
const requestSession = cache(async (): Promise<RequestSession | null> => {
  const fromProxy = sessionFromProxy(await headers());
  if (fromProxy !== undefined) return fromProxy;
  const session = await auth();
  return session?.user?.id ? { id: session.user.id, sv: session.sv, authAt: session.authAt } : null;
});

/**
 * The signed-in user, read from the database on every request (cached for the request), so that a
 * disabled account, a changed role or a bumped session version takes effect on the next request.
 */
export const getCurrentUser = cache(async (): Promise<CurrentUser | null> => {
  const session = await requestSession();
  const id = session?.id;
  if (!id || !/^[0-9a-f-]{36}$/i.test(id)) return null;
  const sessionVersion = session?.sv;
  const [row] = await db
    .select({
      ...currentUserColumns,
      sessionVersion: users.sessionVersion,
      disabledAt: users.disabledAt,
    })
    .from(users)
    .where(eq(users.id, id))
    .limit(1);
  if (!row || row.disabledAt) return null;
  if (sessionVersion !== row.sessionVersion) return null;
  const { sessionVersion: _version, disabledAt: _disabled, ...user } = row;
  return user;
});

/**
 * When this request's session last signed in at the institution's provider (ms since epoch, the
 * provider's auth_time), or null for a password session: signing by institutional sign-in needs a
 * recent one (lib/signing/password.ts).
 */
export const currentSessionAuthAt = cache(async (): Promise<number | null> => {
  const session = await requestSession();
  return typeof session?.authAt === "number" ? session.authAt : null;
});

export function can(user: Pick<CurrentUser, "roles"> | null, permission: Permission): boolean {
  return Boolean(user && rolesHave(user.roles, permission));
}

/** A signed-in user who may use the workspace ("workspace.use"; a responder's account may not). */
export async function requireUser(): Promise<CurrentUser> {
  const user = await getCurrentUser();
  if (!user) throw unauthenticated();
  if (!can(user, "workspace.use")) throw forbidden();
  return user;
}

export async function requirePermission(permission: Permission): Promise<CurrentUser> {
  const user = await requireUser();
  if (!can(user, permission)) throw forbidden();
  return user;
}

/**
 * For pages: signed-out visitors go to the sign-in page; a missing permission shows a 403 page. A page
 * that names no permission still needs "workspace.use" (every role but the responder's), so an
 * account that may see only the live sheet is refused everywhere else by default.
 */
export async function requirePageUser(permission?: Permission, from?: string): Promise<CurrentUser> {
  const user = await requireSignedInPage(from);
  if (!can(user, permission ?? "workspace.use")) redirect("/forbidden");
  return user;
}

/**
 * Only signed in, whatever the account may do: for the signed-in frame (app/(app)/layout.tsx) and the
 * 403 page, which every account must be able to reach. Pages use requirePageUser.
 */
export async function requireSignedInPage(from?: string): Promise<CurrentUser> {
  const user = await getCurrentUser();
  if (!user) {
    // The page asked for, query included, as proxy.ts saw it; else the page's own path. The sign-in
    // page reduces it to a path on this site (returnPathSchema) whatever a client sent.
    const asked = (await headers()).get(ASKED_PATH_HEADER) ?? from;
    redirect(asked && asked !== "/" ? `/sign-in?from=${encodeURIComponent(asked)}` : "/sign-in");
  }
  return user;
}

export function assertCan(user: CurrentUser, permission: Permission, message?: string): void {
  if (!can(user, permission)) throw forbidden(message);
}

export { AppError };
