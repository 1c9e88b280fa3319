// `npm run verify:records`: walks the audit hash chain and every decision's seal, prints what it
// checked and the first broken link of each; exits 1 when something is broken (for a cron job or a
// monitor), 2 when it could not run. Uses the app's connection (read-only queries).
import "@/lib/jobs/standalone";
import { loadLocalEnv } from "@/scripts/lib/load-env";

loadLocalEnv();
const { closeDb, getDb } = await import("@/db");
const { verifyRecords } = await import("@/lib/records/verify");

try {
  const report = await verifyRecords(getDb());
  const { chain, decisions } = report;
  console.log(`Audit trail: ${chain.rows} events${chain.firstRowAt ? `, chained from ${chain.firstRowAt}` : ""}`);
  if (chain.head) console.log(`  head: link ${chain.head.seq} ${chain.head.hash}`);
  console.log(chain.firstBreak ? `  BROKEN at ${chain.firstBreak.where}: ${chain.firstBreak.reason}` : "  intact");
  console.log(`Signed decisions: ${decisions.checked} checked`);
  console.log(
    decisions.firstBreak ? `  BROKEN at ${decisions.firstBreak.where}: ${decisions.firstBreak.reason}` : "  intact",
  );
  process.exitCode = report.ok ? 0 : 1;
} catch (error) {
  console.error("verify:records could not run:", error instanceof Error ? error.message : error);
  process.exitCode = 2;
} finally {
  await closeDb();
}
