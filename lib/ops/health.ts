import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/db";
import { getStorage } from "@/lib/storage";
import { isDraining } from "./lifecycle";

// Readiness for a load balancer: this server may take requests when it is not shutting down, its
// database answers and its file store answers, each within CHECK_TIMEOUT_MS. The answer names each
// check as "ok" or "failing" and nothing more: the endpoint is public, and error text could tell an
// outsider about the deployment.

const CHECK_TIMEOUT_MS = 2_000;

export type Readiness = {
  ready: boolean;
  status: "ready" | "draining" | "not-ready";
  checks: { database: "ok" | "failing"; storage: "ok" | "failing" };
};

async function within(ms: number, work: () => Promise<unknown>): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      work(),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error("timed out")), ms);
      }),
    ]);
    return true;
  } catch {
    return false;
  } finally {
    clearTimeout(timer);
  }
}

export async function readiness(): Promise<Readiness> {
  const [database, storage] = await Promise.all([
    within(CHECK_TIMEOUT_MS, () => db.execute(sql`select 1`)),
    within(CHECK_TIMEOUT_MS, async () => (await getStorage()).check()),
  ]);
  const draining = isDraining();
  const ready = !draining && database && storage;
  return {
    ready,
    status: draining ? "draining" : ready ? "ready" : "not-ready",
    checks: { database: database ? "ok" : "failing", storage: storage ? "ok" : "failing" },
  };
}
