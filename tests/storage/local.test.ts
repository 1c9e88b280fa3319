import fs from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { LocalStorage, newKey, type Storage } from "@/lib/storage";

describe("LocalStorage (lib/storage/local.ts)", () => {
  let root: string;
  beforeAll(async () => {
    root = await fs.mkdtemp(path.join(os.tmpdir(), "benchclear-storage-"));
  });
  afterAll(async () => {
    await fs.rm(root, { recursive: true, force: true });
  });

  it("writes, reads, finds and deletes a file under the root, leaving no temporary files", async () => {
    const storage: Storage = new LocalStorage(root);
    const key = newKey("attachments", "png");
    expect(key).toMatch(/^attachments\/[0-9a-f]{32}\.png$/);
    await storage.put(key, Buffer.from("bytes"), "image/png");
    expect((await storage.get(key))?.toString()).toBe("bytes");
    expect(await storage.exists(key)).toBe(true);
    expect(await fs.readdir(path.join(root, "attachments"))).toEqual([key.split("/")[1]]);
    await storage.delete(key);
    expect(await storage.exists(key)).toBe(false);
    expect(await storage.get(key)).toBeNull();
    await storage.delete(key);
  });

  it("gives every key 128 random bits", () => {
    const keys = new Set(Array.from({ length: 1000 }, () => newKey("attachments", "pdf")));
    expect(keys.size).toBe(1000);
  });

  it("refuses keys that leave the root", async () => {
    const storage: Storage = new LocalStorage(root);
    for (const key of ["../outside.txt", "a/../../b", "/etc/passwd", "a//b", "Upper/case"]) {
      await expect(storage.put(key, Buffer.from("x"), "text/plain"), key).rejects.toThrow(/unsafe storage key/);
    }
  });
});

describe("getStorage()", () => {
  it("chooses S3 when STORAGE_DRIVER=s3 and the local disk otherwise", async () => {
    const saved = { ...process.env };
    try {
      vi.resetModules();
      Object.assign(process.env, {
        STORAGE_DRIVER: "s3",
        S3_BUCKET: "benchclear-test",
        S3_ENDPOINT: "https://s3.test.invalid",
        S3_FORCE_PATH_STYLE: "true",
      });
      const s3Module = await import("@/lib/storage");
      const { S3Storage } = await import("@/lib/storage/s3");
      expect(await s3Module.getStorage()).toBeInstanceOf(S3Storage);

      vi.resetModules();
      process.env.STORAGE_DRIVER = "local";
      const localModule = await import("@/lib/storage");
      expect(await localModule.getStorage()).toBeInstanceOf(localModule.LocalStorage);
    } finally {
      for (const key of Object.keys(process.env)) if (!(key in saved)) delete process.env[key];
      Object.assign(process.env, saved);
      vi.resetModules();
    }
  });
});
