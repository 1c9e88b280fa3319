import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import { env } from "@/lib/env";
import * as schema from "./schema";

// One pool per process. In development Next.js reloads modules, so the pool is kept on globalThis.
// An idle client that loses its connection (PostgreSQL restarted) emits 'error' on the pool; logging
// it instead of crashing lets the next query reconnect.

export type Database = NodePgDatabase<typeof schema> & { $client: Pool };

const globalForDb = globalThis as unknown as { benchclearPool?: Pool; benchclearDb?: Database };

function createPool(): Pool {
  const config = env();
  const pool = new Pool({
    connectionString: config.DATABASE_URL,
    max: config.DATABASE_POOL_MAX,
    connectionTimeoutMillis: 10_000,
    idleTimeoutMillis: 30_000,
    application_name: "benchclear",
  });
  pool.on("error", (error) => console.error("[db] idle client error:", error.message));
  return pool;
}

export function getDb(): Database {
  if (!globalForDb.benchclearDb) {
    globalForDb.benchclearPool = createPool();
    globalForDb.benchclearDb = drizzle({ client: globalForDb.benchclearPool, schema, casing: "snake_case" });
  }
  return globalForDb.benchclearDb;
}

/** The database client, created on first use so that importing this module needs no connection. */
export const db: Database = new Proxy({} as Database, {
  get(_target, property) {
    const real = getDb();
    const value = Reflect.get(real, property, real);
    return typeof value === "function" ? value.bind(real) : value;
  },
});

export async function closeDb(): Promise<void> {
  const pool = globalForDb.benchclearPool;
  globalForDb.benchclearPool = undefined;
  globalForDb.benchclearDb = undefined;
  await pool?.end();
}

export { schema };
