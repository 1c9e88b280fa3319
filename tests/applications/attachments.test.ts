import crypto from "node:crypto";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applicationRevisions, attachments } from "@/db/schema";
import { ATTACHMENT_MAX_COUNT } from "@/lib/applications/limits";
import { createDepartment, createUser, requireDatabase } from "../support/db";
import { http, signIn } from "../support/http";
import {
  completeDraft,
  createDraft,
  download,
  instructorWithReviewer,
  pdfBytes,
  pngBytes,
  signedInInstructor,
  submit,
  upload,
} from "./support";

requireDatabase();

const fileUrl = (id: string, attachmentId: string) => `/api/applications/${id}/attachments/${attachmentId}`;

describe("POST /api/applications/[id]/attachments", () => {
  it("stores a PNG under a generated name and serves it to the applicant with its real type", async () => {
    const { cookie } = await instructorWithReviewer();
    const { id } = await createDraft(cookie);
    const png = pngBytes(16, 16);
    const res = await upload(cookie, id, png, "bench photo.png", "image/png");
    expect(res.status, res.text).toBe(201);
    const file = res.json!.attachment;
    expect(file).toMatchObject({
      filename: "bench photo.png",
      contentType: "image/png",
      size_B: png.length,
      sha256: crypto.createHash("sha256").update(png).digest("hex"),
    });
    const [row] = await getDb().select().from(attachments).where(eq(attachments.id, file.id));
    expect(row.storageKey).toMatch(/^attachments\/[0-9a-f]{32}\.png$/);
    expect(row.storageKey).not.toContain("bench");

    const got = await download(cookie, fileUrl(id, file.id));
    expect(got.status).toBe(200);
    expect(got.bytes.equals(png)).toBe(true);
    expect(got.headers.get("content-type")).toBe("image/png");
    expect(got.headers.get("x-content-type-options")).toBe("nosniff");
    expect(got.headers.get("content-disposition")).toMatch(/^inline; filename="bench photo.png"/);
    const asDownload = await download(cookie, `${fileUrl(id, file.id)}?download=1`);
    expect(asDownload.headers.get("content-disposition")).toMatch(/^attachment;/);
  });

  it("accepts a PDF whatever the browser claims, and serves it as a download", async () => {
    const { cookie } = await instructorWithReviewer();
    const { id } = await createDraft(cookie);
    const res = await upload(cookie, id, pdfBytes(), "schematic", "text/plain");
    expect(res.status, res.text).toBe(201);
    expect(res.json!.attachment.contentType).toBe("application/pdf");
    const got = await download(cookie, fileUrl(id, res.json!.attachment.id));
    expect(got.headers.get("content-type")).toBe("application/pdf");
    expect(got.headers.get("content-disposition")).toMatch(/^attachment; filename="schematic"/);
  });

  it("refuses an HTML page renamed .png, an SVG and a 20 MB file, with a clear message, and stores nothing", async () => {
    const { cookie } = await instructorWithReviewer();
    const { id } = await createDraft(cookie);
    const html = Buffer.from("<!doctype html><html><body><script>alert(1)</script></body></html>");
    const renamed = await upload(cookie, id, html, "photo.png", "image/png");
    expect(renamed.status).toBe(422);
    expect(renamed.json!.error.issues[0]).toMatchObject({ path: "file" });
    expect(renamed.json!.error.message).toMatch(/Only JPEG, PNG, WebP and PDF files can be attached/);

    const svg = Buffer.from(
      '<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><rect width="10" height="10"/></svg>',
    );
    const svgRes = await upload(cookie, id, svg, "diagram.svg", "image/svg+xml");
    expect(svgRes.status).toBe(422);
    expect(svgRes.json!.error.message).toMatch(/Only JPEG, PNG, WebP and PDF/);

    // 20 MB of a real PNG header followed by padding: refused for its size before its type.
    const big = Buffer.alloc(20_000_000);
    pngBytes().copy(big);
    const bigRes = await upload(cookie, id, big, "huge.png", "image/png");
    expect(bigRes.status).toBe(413);
    expect(bigRes.json!.error.message).toMatch(/at most 10.0 MB/);

    const empty = await upload(cookie, id, Buffer.alloc(0), "empty.png", "image/png");
    expect(empty.status).toBe(422);

    const rows = await getDb().select().from(attachments).where(eq(attachments.applicationId, id));
    expect(rows).toHaveLength(0);
  });

  it(`refuses a file beyond ${ATTACHMENT_MAX_COUNT} per application`, async () => {
    const { cookie } = await instructorWithReviewer();
    const { id } = await createDraft(cookie);
    for (let i = 0; i < ATTACHMENT_MAX_COUNT; i++) {
      expect((await upload(cookie, id, pngBytes(4 + i, 4), `p${i}.png`, "image/png")).status).toBe(201);
    }
    const extra = await upload(cookie, id, pngBytes(), "one-too-many.png", "image/png");
    expect(extra.status).toBe(422);
    expect(extra.json!.error.message).toMatch(/at most 10 files/);
  });

  it("refuses uploads to someone else's draft and a body that is not multipart", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const { id } = await createDraft(cookie);
    const other = await signedInInstructor(instructor.departmentId);
    expect((await upload(other.cookie, id, pngBytes(), "x.png")).status).toBe(404);
    const json = await http(`/api/applications/${id}/attachments`, { method: "POST", cookie, body: { file: "x" } });
    expect(json.status).toBe(415);
    const crossSite = await http(`/api/applications/${id}/attachments`, {
      method: "POST",
      cookie,
      headers: { origin: "https://elsewhere.example" },
      rawBody: "x",
    });
    expect(crossSite.status).toBe(403);
  });
});

describe("GET and DELETE /api/applications/[id]/attachments/[attachmentId]", () => {
  it("a draft's files are the applicant's alone; after submission the department's reviewer may read them", async () => {
    const { instructor, reviewer, cookie } = await instructorWithReviewer();
    const { id } = await createDraft(cookie);
    const file = (await upload(cookie, id, pngBytes(), "p.png")).json!.attachment;
    const url = fileUrl(id, file.id);

    const reviewerCookie = await signIn(reviewer.email);
    const sameDept = await signedInInstructor(instructor.departmentId);
    const otherReviewer = await createUser({ roles: ["reviewer"], departmentId: (await createDepartment()).id });
    const otherReviewerCookie = await signIn(otherReviewer.email);
    expect((await download(undefined, url)).status).toBe(401);
    expect((await download(reviewerCookie, url)).status).toBe(404);
    expect((await download(sameDept.cookie, url)).status).toBe(404);

    // Submit with the file attached.
    const created = await savedDraftWithFile(cookie, instructor, id);
    expect((await submit(cookie, id, created.version)).status).toBe(200);
    expect((await download(reviewerCookie, url)).status).toBe(200);
    expect((await download(otherReviewerCookie, url)).status).toBe(404);
    expect((await download(sameDept.cookie, url)).status).toBe(404);
    // Another application's id with this file's id finds nothing.
    const { id: otherApp } = await createDraft(cookie);
    expect((await download(cookie, fileUrl(otherApp, file.id))).status).toBe(404);
  });

  it("removes a file from the draft; a file a submitted revision lists stays readable", async () => {
    const { instructor, cookie } = await instructorWithReviewer();
    const { id } = await createDraft(cookie);
    const loose = (await upload(cookie, id, pngBytes(5, 5), "loose.png")).json!.attachment;
    const kept = (await upload(cookie, id, pngBytes(6, 6), "kept.png")).json!.attachment;

    const other = await signedInInstructor(instructor.departmentId);
    expect((await http(fileUrl(id, loose.id), { method: "DELETE", cookie: other.cookie })).status).toBe(404);
    const removed = await http(fileUrl(id, loose.id), { method: "DELETE", cookie });
    expect(removed.status, removed.text).toBe(200);
    expect((await download(cookie, fileUrl(id, loose.id))).status).toBe(404);
    expect((await http(fileUrl(id, loose.id), { method: "DELETE", cookie })).status).toBe(404);

    const { version } = await savedDraftWithFile(cookie, instructor, id);
    const sub = await submit(cookie, id, version);
    expect(sub.status, sub.text).toBe(200);
    const [revision] = await getDb()
      .select()
      .from(applicationRevisions)
      .where(eq(applicationRevisions.applicationId, id));
    expect((revision.content as { attachments: { id: string }[] }).attachments.map((a) => a.id)).toEqual([kept.id]);
    // Submitted: the file can no longer be removed, and stays readable.
    expect((await http(fileUrl(id, kept.id), { method: "DELETE", cookie })).status).toBe(409);
    expect((await download(cookie, fileUrl(id, kept.id))).status).toBe(200);
  });
});

/** Saves a complete draft into an existing application (which already has its files). */
async function savedDraftWithFile(cookie: string, instructor: { id: string; name: string }, id: string) {
  const current = await http(`/api/applications/${id}/draft`, { cookie });
  const res = await http(`/api/applications/${id}/draft`, {
    method: "PATCH",
    cookie,
    body: { expectedVersion: current.json!.application.version, step: 6, draft: completeDraft(instructor) },
  });
  expect(res.status, res.text).toBe(200);
  return { version: res.json!.application.version as number };
}
