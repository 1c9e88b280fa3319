import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { z } from "zod";
import { db } from "@/db";
import { applications, commentReplies, decisions } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { canReadApplication } from "@/lib/applications/access";
import { conflict, notFound } from "@/lib/errors";

// The applicant answers a reviewer's return comment ("the gap is 9.4 mm, measured twice"). The
// signed decision is never changed: the reply is its own row, in the same transaction as its audit
// row, and reviewers read it beside the comment and in the timeline.

export const REPLY_MAX_CHARS = 2000;

export const replyBodySchema = z.strictObject({
  decisionId: z.uuid({ error: "Name the comment you answer (decisionId)." }),
  body: z
    .string({ error: "Write your reply." })
    .trim()
    .min(1, "Write your reply.")
    .max(REPLY_MAX_CHARS, `Use at most ${REPLY_MAX_CHARS} characters.`),
});

export type ReplyBody = z.infer<typeof replyBodySchema>;

export async function replyToComment(actor: CurrentUser, applicationId: string, input: ReplyBody) {
  assertCan(actor, "application.create");
  return db.transaction(async (tx) => {
    const [app] = await tx
      .select({ applicantId: applications.applicantId })
      .from(applications)
      .where(eq(applications.id, applicationId))
      .limit(1);
    // Only the applicant answers comments on their application; to anyone else it does not exist here.
    if (!app || app.applicantId !== actor.id) throw notFound("That application");
    const [decision] = await tx
      .select({ id: decisions.id, kind: decisions.kind })
      .from(decisions)
      .where(and(eq(decisions.id, input.decisionId), eq(decisions.applicationId, applicationId)))
      .limit(1);
    if (!decision) throw notFound("That comment");
    if (decision.kind !== "return") throw conflict("Only a return comment can be answered here.");
    const [reply] = await tx
      .insert(commentReplies)
      .values({
        applicationId,
        decisionId: decision.id,
        authorId: actor.id,
        authorName: actor.name,
        body: input.body,
      })
      .returning();
    await writeAudit(tx, {
      actor,
      action: "application.comment_replied",
      entityType: "application",
      entityId: applicationId,
      data: { decisionId: decision.id, replyId: reply.id, reply: input.body },
    });
    return { id: reply.id, decisionId: reply.decisionId, body: reply.body, createdAt: reply.createdAt };
  });
}

export type ReplyView = { id: string; decisionId: string; authorName: string; body: string; createdAt: Date };

/** Every reply on an application, oldest first, for someone who may read the application. */
export async function repliesFor(user: CurrentUser, applicationId: string): Promise<ReplyView[]> {
  const [app] = await db
    .select({
      applicantId: applications.applicantId,
      departmentId: applications.departmentId,
      submittedAt: applications.submittedAt,
      namedUserIds: applications.namedUserIds,
    })
    .from(applications)
    .where(eq(applications.id, applicationId));
  if (!app || !canReadApplication(user, app)) return [];
  return db
    .select({
      id: commentReplies.id,
      decisionId: commentReplies.decisionId,
      authorName: commentReplies.authorName,
      body: commentReplies.body,
      createdAt: commentReplies.createdAt,
    })
    .from(commentReplies)
    .where(eq(commentReplies.applicationId, applicationId))
    .orderBy(asc(commentReplies.createdAt));
}
