// The S3 storage against an msw fake of the S3 REST API (path-style, on a made-up host): the SDK's
// real requests — signed PUT, GET, HEAD and DELETE of objects — answered from an in-memory bucket.
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { S3Storage } from "@/lib/storage/s3";

const ENDPOINT = "https://s3.test.invalid";
const BUCKET = "benchclear-test";

type Stored = { body: Buffer; contentType: string };
const objects = new Map<string, Stored>();
const seen: { method: string; path: string; authorization: string | null }[] = [];

function keyOf(request: Request): string | null {
  const path = decodeURIComponent(new URL(request.url).pathname);
  const prefix = `/${BUCKET}/`;
  return path.startsWith(prefix) ? path.slice(prefix.length) : null;
}

function record(request: Request) {
  seen.push({
    method: request.method,
    path: new URL(request.url).pathname,
    authorization: request.headers.get("authorization"),
  });
}

const noSuchKey = (key: string) =>
  new HttpResponse(
    `<?xml version="1.0" encoding="UTF-8"?><Error><Code>NoSuchKey</Code><Message>The specified key does not exist.</Message><Key>${key}</Key></Error>`,
    { status: 404, headers: { "Content-Type": "application/xml" } },
  );

const server = setupServer(
  http.put(`${ENDPOINT}/${BUCKET}/*`, async ({ request }) => {
    record(request);
    const key = keyOf(request)!;
    objects.set(key, {
      body: Buffer.from(await request.arrayBuffer()),
      contentType: request.headers.get("content-type") ?? "binary/octet-stream",
    });
    return new HttpResponse(null, { status: 200, headers: { ETag: '"fake-etag"' } });
  }),
  http.get(`${ENDPOINT}/${BUCKET}/*`, ({ request }) => {
    record(request);
    const key = keyOf(request)!;
    const object = objects.get(key);
    if (!object) return noSuchKey(key);
    return new HttpResponse(new Uint8Array(object.body), {
      status: 200,
      headers: {
        "Content-Type": object.contentType,
        "Content-Length": String(object.body.length),
        ETag: '"fake-etag"',
      },
    });
  }),
  http.head(`${ENDPOINT}/${BUCKET}/*`, ({ request }) => {
    record(request);
    const object = objects.get(keyOf(request)!);
    if (!object) return new HttpResponse(null, { status: 404 });
    return new HttpResponse(null, {
      status: 200,
      headers: { "Content-Type": object.contentType, "Content-Length": String(object.body.length) },
    });
  }),
  http.delete(`${ENDPOINT}/${BUCKET}/*`, ({ request }) => {
    record(request);
    objects.delete(keyOf(request)!);
    return new HttpResponse(null, { status: 204 });
  }),
);

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  server.resetHandlers();
  seen.length = 0;
});
afterAll(() => server.close());

function storage() {
  return new S3Storage({
    S3_BUCKET: BUCKET,
    S3_REGION: "us-east-1",
    S3_ENDPOINT: ENDPOINT,
    S3_ACCESS_KEY_ID: "AKIDEXAMPLE",
    S3_SECRET_ACCESS_KEY: "example-secret",
    S3_FORCE_PATH_STYLE: true,
  });
}

describe("S3Storage (lib/storage/s3.ts) against a fake S3 API", () => {
  it("puts an object with its content type and reads the same bytes back", async () => {
    const s3 = storage();
    const bytes = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 1, 2, 3, 255]);
    await s3.put("attachments/0123abcd.png", bytes, "image/png");
    expect(objects.get("attachments/0123abcd.png")).toEqual({ body: bytes, contentType: "image/png" });
    const back = await s3.get("attachments/0123abcd.png");
    expect(back?.equals(bytes)).toBe(true);
    // Path-style addressing on the configured endpoint, every request signed with SigV4.
    expect(seen.map((r) => `${r.method} ${r.path}`)).toEqual([
      `PUT /${BUCKET}/attachments/0123abcd.png`,
      `GET /${BUCKET}/attachments/0123abcd.png`,
    ]);
    for (const r of seen) expect(r.authorization).toMatch(/^AWS4-HMAC-SHA256 Credential=AKIDEXAMPLE\//);
  });

  it("answers null and false for a missing key instead of throwing", async () => {
    const s3 = storage();
    expect(await s3.get("attachments/missing.pdf")).toBeNull();
    expect(await s3.exists("attachments/missing.pdf")).toBe(false);
  });

  it("tells whether a key exists, and deletes it", async () => {
    const s3 = storage();
    await s3.put("permits/hv-2026-0001.pdf", Buffer.from("%PDF-1.4\n"), "application/pdf");
    expect(await s3.exists("permits/hv-2026-0001.pdf")).toBe(true);
    await s3.delete("permits/hv-2026-0001.pdf");
    expect(objects.has("permits/hv-2026-0001.pdf")).toBe(false);
    expect(await s3.exists("permits/hv-2026-0001.pdf")).toBe(false);
    expect(seen.map((r) => r.method)).toEqual(["PUT", "HEAD", "DELETE", "HEAD"]);
  });

  it("passes a server error on rather than reporting the object missing", async () => {
    server.use(
      http.get(
        `${ENDPOINT}/${BUCKET}/*`,
        () => new HttpResponse("<Error><Code>InternalError</Code></Error>", { status: 500 }),
      ),
    );
    const s3 = storage();
    // The SDK retries 5xx answers; keep the test quick by letting it fail fast.
    vi.spyOn(Math, "random").mockReturnValue(0);
    await expect(s3.get("attachments/x.png")).rejects.toThrow();
    vi.restoreAllMocks();
  });

  it("refuses keys that could climb out of the bucket's prefix", async () => {
    const s3 = storage();
    await expect(s3.put("../etc/passwd", Buffer.from("x"), "text/plain")).rejects.toThrow(/unsafe storage key/);
    await expect(s3.get("attachments//x")).rejects.toThrow(/unsafe storage key/);
    await expect(s3.delete("/absolute")).rejects.toThrow(/unsafe storage key/);
    expect(seen).toHaveLength(0);
  });

  it("is refused without a bucket", () => {
    expect(() => new S3Storage({ S3_REGION: "us-east-1", S3_FORCE_PATH_STYLE: true } as never)).toThrow(/S3_BUCKET/);
  });
});
