import "server-only";
import path from "node:path";
import { env } from "@/lib/env";
import { LocalStorage } from "./local";
import type { Storage } from "./types";

// The storage factory: STORAGE_DRIVER picks "local" (./local.ts) or "s3" (./s3.ts, for deployments
// with several app servers). The S3 client loads only when it is chosen.

export { assertSafeKey, newKey, type Storage } from "./types";
export { LocalStorage } from "./local";

let instance: Storage | undefined;

export async function getStorage(): Promise<Storage> {
  if (instance) return instance;
  const config = env();
  if (config.STORAGE_DRIVER === "s3") {
    const { S3Storage } = await import("./s3");
    instance = new S3Storage(config);
  } else {
    instance = new LocalStorage(path.resolve(config.STORAGE_DIR));
  }
  return instance;
}
