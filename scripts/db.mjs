#!/usr/bin/env node
// `npm run db:up` / `npm run db:down`: start or stop the project-local PostgreSQL by hand (for
// `npm run dev`, drizzle-kit or psql). `db:up` prints the DATABASE_URL.
import { databaseUrl, ensureDatabase, fail, localEnv, pgDown, pgUp, step } from "./lib/services.mjs";

const command = process.argv[2];
try {
  const env = localEnv();
  if (command === "up") {
    await pgUp(env);
    ensureDatabase(env, "benchclear");
    step(`PostgreSQL is up: ${databaseUrl(env, "benchclear").replace(/:[^:@/]+@/, ":***@")}`);
  } else if (command === "down") {
    if (!pgDown()) step("PostgreSQL is not running");
  } else {
    throw new Error("usage: node scripts/db.mjs up|down");
  }
} catch (error) {
  fail(error);
}
