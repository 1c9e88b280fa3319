import "server-only";
import crypto from "node:crypto";
import fs from "node:fs/promises";
import path from "node:path";
import { assertSafeKey, type Storage } from "./types";

// Files under STORAGE_DIR (outside public/, never served directly): the driver for one app server.
// Writes go to a temporary file first and are renamed, so a reader never sees half a file.

export class LocalStorage implements Storage {
  constructor(private readonly root: string) {}

  private file(key: string): string {
    assertSafeKey(key);
    return path.join(this.root, key);
  }

  async put(key: string, body: Buffer): Promise<void> {
    const file = this.file(key);
    await fs.mkdir(path.dirname(file), { recursive: true });
    const tmp = `${file}.${process.pid}.${crypto.randomBytes(4).toString("hex")}.tmp`;
    try {
      await fs.writeFile(tmp, body);
      await fs.rename(tmp, file);
    } catch (error) {
      // A half-written file (disk full, permissions) must not stay behind as an orphan.
      await fs.rm(tmp, { force: true }).catch(() => undefined);
      throw error;
    }
  }

  async get(key: string): Promise<Buffer | null> {
    try {
      return await fs.readFile(this.file(key));
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === "ENOENT") return null;
      throw error;
    }
  }

  async exists(key: string): Promise<boolean> {
    try {
      await fs.access(this.file(key));
      return true;
    } catch {
      return false;
    }
  }

  async delete(key: string): Promise<void> {
    await fs.rm(this.file(key), { force: true });
  }

  async check(): Promise<void> {
    await fs.mkdir(this.root, { recursive: true });
    await fs.access(this.root, fs.constants.R_OK | fs.constants.W_OK);
  }
}
