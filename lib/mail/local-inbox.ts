import "server-only";
import fs from "node:fs/promises";
import path from "node:path";
import { z } from "zod";
import { env } from "@/lib/env";

// Reads the local inbox's store (scripts/local-inbox.ts writes one JSON file per received
// message into LOCAL_INBOX_DIR). Only for development and tests: /dev/mail and its API refuse to
// work unless MAIL_TRANSPORT=local-inbox.

export const CAUGHT_ID = /^\d{10,16}-[0-9a-f]{8}$/;
const LIST_LIMIT = 200;

const caughtSchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  envelope: z.object({ from: z.string().nullable(), to: z.array(z.string()) }),
  messageId: z.string().nullable(),
  subject: z.string(),
  from: z.string(),
  to: z.string(),
  headers: z.record(z.string(), z.string()),
  text: z.string(),
  html: z.string(),
  attachments: z.array(
    z.object({
      filename: z.string().nullable(),
      contentType: z.string(),
      size: z.number(),
      content: z.string().optional(),
    }),
  ),
});

export type CaughtMessage = z.infer<typeof caughtSchema>;
export type CaughtSummary = Omit<CaughtMessage, "text" | "html" | "headers" | "attachments"> & {
  kind: string | null;
  attachments: { filename: string | null; contentType: string; size: number }[];
  /** How many deliveries carried this Message-ID (more than 1 = the same message arrived again). */
  deliveries: number;
};

export function inboxEnabled(): boolean {
  return env().MAIL_TRANSPORT === "local-inbox";
}

export function inboxDir(): string {
  // Set per test database by scripts/test.mjs; `npm start` uses the default.
  // The folder is chosen at run time; the ignore comments keep the build from tracing the project.
  return path.resolve(/*turbopackIgnore: true*/ process.env.LOCAL_INBOX_DIR || ".data/mail");
}

async function readOne(file: string): Promise<CaughtMessage | null> {
  try {
    const parsed = caughtSchema.safeParse(JSON.parse(await fs.readFile(/*turbopackIgnore: true*/ file, "utf8")));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

async function fileNames(): Promise<string[]> {
  try {
    const names = await fs.readdir(/*turbopackIgnore: true*/ inboxDir());
    return names.filter((n) => n.endsWith(".json") && CAUGHT_ID.test(n.slice(0, -5)));
  } catch {
    return [];
  }
}

/** The newest caught messages first, at most 200. */
export async function listCaught(limit = LIST_LIMIT): Promise<CaughtSummary[]> {
  // File names start with the receiving time in ms, so a string sort orders them (same length).
  const names = (await fileNames()).sort().reverse();
  const messages = (
    await Promise.all(names.slice(0, limit).map((n) => readOne(path.join(/*turbopackIgnore: true*/ inboxDir(), n))))
  ).filter((m): m is CaughtMessage => m !== null);
  const deliveries = new Map<string, number>();
  for (const m of messages) if (m.messageId) deliveries.set(m.messageId, (deliveries.get(m.messageId) ?? 0) + 1);
  return messages.map((m) => ({
    id: m.id,
    receivedAt: m.receivedAt,
    envelope: m.envelope,
    messageId: m.messageId,
    subject: m.subject,
    from: m.from,
    to: m.to,
    kind: m.headers["x-benchclear-kind"] ?? null,
    attachments: m.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, size: a.size })),
    deliveries: m.messageId ? (deliveries.get(m.messageId) ?? 1) : 1,
  }));
}

export async function getCaught(id: string): Promise<CaughtMessage | null> {
  if (!CAUGHT_ID.test(id)) return null;
  return readOne(path.join(/*turbopackIgnore: true*/ inboxDir(), `${id}.json`));
}
