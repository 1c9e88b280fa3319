// Run by tests/reports/demo-story-report.test.ts in a child process, against a database of its own
// (DATABASE_URL, already migrated): puts the whole demo data in as `npm start` does
// (scripts/demo-data.ts), then reads the committee report (default range, all departments) and the
// live sheet as the demo's safety officer would, and prints both as one JSON line.
import "@/lib/jobs/standalone";

async function main() {
  const { seed } = await import("@/scripts/demo-data");
  const { closeDb, getDb } = await import("@/db");
  const { eq } = await import("drizzle-orm");
  const { users } = await import("@/db/schema");
  const { currentUserColumns } = await import("@/lib/auth/current-user");
  const { committeeReport, reportFilters } = await import("@/lib/reports/queries");
  const { liveSheet } = await import("@/lib/permits/live");

  await seed();
  const [officer] = await getDb()
    .select(currentUserColumns)
    .from(users)
    .where(eq(users.email, "officer@benchclear.test"));
  const report = await committeeReport(officer, await reportFilters({}));
  const live = await liveSheet(officer);
  process.stdout.write(`\nREPORT ${JSON.stringify({ report, live })}\n`);
  await closeDb();
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
