#!/usr/bin/env node
// The floor for `npm run bench`: a bare node:http + pg server that answers each measured route by
// running exactly the SQL statements the app ran for it (captured from PostgreSQL's statement log by
// scripts/bench/index.ts), with the same parameters, and nothing else: no framework, no session, no
// validation, no rendering. Reads are sent at once on the pool (the fastest order); a route that ran
// a transaction replays it in order on one connection. The client address the app saw is swapped for
// this request's X-Forwarded-For, so rate-limit rows are per client here too. A stored PDF is read
// from disk and sent, as the app does.
//
// Usage: node scripts/bench/baseline.mjs <plan.json> <port>   (DATABASE_URL in the environment)
import fs from "node:fs";
import http from "node:http";
import pg from "pg";

const [planFile, portText] = process.argv.slice(2);
const plan = JSON.parse(fs.readFileSync(planFile, "utf8"));
// The app's pool has DATABASE_POOL_MAX connections (default 10): the same here.
const pool = new pg.Pool({
  connectionString: process.env.DATABASE_URL,
  max: Number(process.env.DATABASE_POOL_MAX ?? 10),
});
pool.on("error", () => {});

function paramsFor(statement, clientAddress) {
  if (!plan.captureAddress || !clientAddress) return statement.params;
  return statement.params.map((p) => (typeof p === "string" ? p.split(plan.captureAddress).join(clientAddress) : p));
}

async function runRoute(route, clientAddress) {
  const statements = route.statements;
  if (statements.some((s) => /^\s*(begin|start transaction)\b/i.test(s.text))) {
    const client = await pool.connect();
    let last;
    try {
      for (const s of statements) last = await client.query(s.text, paramsFor(s, clientAddress));
    } catch (error) {
      await client.query("ROLLBACK").catch(() => {});
      throw error;
    } finally {
      client.release();
    }
    return last?.rows ?? [];
  }
  const results = await Promise.all(statements.map((s) => pool.query(s.text, paramsFor(s, clientAddress))));
  return results.at(-1)?.rows ?? [];
}

const server = http.createServer((req, res) => {
  const name = decodeURIComponent((req.url ?? "/").slice(1).split("?")[0]);
  const route = plan.routes[name];
  // Drain the body (autosave, assess) before answering, as any server must.
  req.resume();
  req.on("end", async () => {
    if (!route) {
      res.writeHead(404).end();
      return;
    }
    try {
      const forwarded = req.headers["x-forwarded-for"];
      const rows = await runRoute(route, typeof forwarded === "string" ? forwarded.split(",").at(-1).trim() : null);
      if (route.file) {
        const bytes = await fs.promises.readFile(route.file);
        res.writeHead(200, { "content-type": "application/pdf", "content-length": bytes.length }).end(bytes);
        return;
      }
      const body = JSON.stringify(rows);
      res.writeHead(200, { "content-type": "application/json", "content-length": Buffer.byteLength(body) }).end(body);
    } catch (error) {
      res.writeHead(500, { "content-type": "text/plain" }).end(String(error?.message ?? error));
    }
  });
});

server.listen(Number(portText), "127.0.0.1", () => console.log(`baseline listening on ${portText}`));
process.on("SIGTERM", () => server.close(() => pool.end().then(() => process.exit(0))));
