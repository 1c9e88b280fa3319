import fs from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { attachments, auditEvents } from "@/db/schema";
import { createDepartment, requireDatabase } from "../support/db";
import { createDraft, pngBytes, signedInInstructor, upload } from "../applications/support";

requireDatabase();

// Issue 14: the file store failing on an upload. The test server stores under STORAGE_DIR; the
// folder for attachments is swapped for a plain file, so every write there fails (as a full or
// read-only disk would, and for root as well, which ignores permission bits). The upload must get
// a clear answer, and leave no attachment row, no audit row and no file behind.
// Before this change the answer was a bare 500 "Something went wrong on our side."

function filesUnder(dir: string): string[] {
  if (!fs.existsSync(dir) || !fs.statSync(dir).isDirectory()) return [];
  return fs.readdirSync(dir, { recursive: true, encoding: "utf8" }).sort();
}

describe("the file store failing on an upload", () => {
  it("answers 503 saying nothing was attached, and leaves no orphan row or file", async () => {
    const { cookie } = await signedInInstructor((await createDepartment()).id);
    const draft = await createDraft(cookie);
    const dir = path.join(process.env.STORAGE_DIR!, "attachments");
    fs.mkdirSync(dir, { recursive: true });
    const aside = `${dir}.aside-${process.pid}`;
    const before = filesUnder(dir);
    fs.renameSync(dir, aside);
    fs.writeFileSync(dir, "not a folder");
    let res;
    try {
      res = await upload(cookie, draft.id, pngBytes(12, 12), "bench.png", "image/png");
    } finally {
      fs.rmSync(dir, { force: true });
      fs.renameSync(aside, dir);
    }
    expect(res.status).toBe(503);
    expect(res.headers.get("retry-after")).toBeTruthy();
    expect(res.json?.error.message).toMatch(/file store could not save this file, so nothing was attached/);
    expect(await getDb().select().from(attachments).where(eq(attachments.applicationId, draft.id))).toEqual([]);
    const audit = await getDb().select().from(auditEvents).where(eq(auditEvents.entityId, draft.id));
    expect(audit.map((a) => a.action)).not.toContain("application.attachment_added");
    expect(filesUnder(dir)).toEqual(before);
    expect(filesUnder(path.dirname(dir)).filter((f) => f.endsWith(".tmp"))).toEqual([]);

    // The store back: the same upload works.
    const again = await upload(cookie, draft.id, pngBytes(12, 12), "bench.png", "image/png");
    expect(again.status, again.text).toBe(201);
  });
});
