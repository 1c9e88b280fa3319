import "server-only";
import crypto from "node:crypto";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import type { CurrentUser } from "@/lib/auth/guards";
import { env } from "@/lib/env";
import { hashCalendarToken } from "./queries";

// Creating, replacing and removing a user's calendar feed token. The token is shown once, in the
// answer that creates it; a new one replaces the old, whose URL stops working at once.

export function calendarFeedUrl(token: string): string {
  return new URL(`/api/calendar/${token}`, env().APP_URL).toString();
}

export async function rotateCalendarToken(user: CurrentUser, now = new Date()): Promise<{ url: string }> {
  const token = crypto.randomBytes(32).toString("base64url"); // 256 bits
  await db.transaction(async (tx) => {
    const [before] = await tx
      .select({ token: users.calendarToken })
      .from(users)
      .where(eq(users.id, user.id))
      .for("update");
    await tx
      .update(users)
      .set({ calendarToken: hashCalendarToken(token), updatedAt: now })
      .where(eq(users.id, user.id));
    await writeAudit(tx, {
      actor: user,
      action: before?.token ? "user.calendar_token_rotated" : "user.calendar_token_created",
      entityType: "user",
      entityId: user.id,
    });
  });
  return { url: calendarFeedUrl(token) };
}

export async function removeCalendarToken(user: CurrentUser, now = new Date()): Promise<{ removed: boolean }> {
  return db.transaction(async (tx) => {
    const [before] = await tx
      .select({ token: users.calendarToken })
      .from(users)
      .where(eq(users.id, user.id))
      .for("update");
    if (!before?.token) return { removed: false };
    await tx.update(users).set({ calendarToken: null, updatedAt: now }).where(eq(users.id, user.id));
    await writeAudit(tx, { actor: user, action: "user.calendar_token_removed", entityType: "user", entityId: user.id });
    return { removed: true };
  });
}
