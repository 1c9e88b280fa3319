// Helpers for the incident and upkeep tests: mail rows by key and recipient, uploads.
import { and, eq, like, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { auditEvents, mailOutbox } from "@/db/schema";
import { baseUrl, randomIp } from "../support/http";

/** Outbox rows of `kind` whose dedupe key starts with `keyPrefix`, as { to, key, data }. */
export async function mailsWithKey(kind: string, keyPrefix: string) {
  const rows = await getDb()
    .select({ to: mailOutbox.toAddress, key: mailOutbox.dedupeKey, data: mailOutbox.data, subject: mailOutbox.subject })
    .from(mailOutbox)
    .where(and(eq(mailOutbox.kind, kind), like(mailOutbox.dedupeKey, `${keyPrefix}%`)));
  return rows;
}

export async function auditActions(entityType: string, entityId: string): Promise<string[]> {
  const rows = await getDb()
    .select({ action: auditEvents.action })
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, entityType), eq(auditEvents.entityId, entityId)))
    .orderBy(sql`${auditEvents.chainSeq}`);
  return rows.map((r) => r.action);
}

/** One file to an upload route through the real multipart endpoint. */
export async function uploadTo(cookie: string, path: string, bytes: Buffer, name: string, type: string) {
  const form = new FormData();
  form.append("file", new Blob([new Uint8Array(bytes)], { type }), name);
  const res = await fetch(`${baseUrl()}${path}`, {
    method: "POST",
    headers: { cookie, origin: baseUrl(), "x-forwarded-for": randomIp() },
    body: form,
  });
  const text = await res.text();
  let json: Record<string, any> | undefined;
  try {
    json = JSON.parse(text);
  } catch {
    json = undefined;
  }
  return { status: res.status, json, headers: res.headers };
}
