// `npm run clock -- <date>`: runs the daily permit job as if it were <date> (YYYY-MM-DD: 06:00 that
// day in the institution's time zone; or a full ISO instant), then sends the mail it queued. For
// trying reminders locally: move the clock to a week before a demo permit ends and its 7-day
// reminder appears at /dev/mail; run it again and nothing new is sent.
//   npm run clock -- 2026-06-01
//   npm run clock -- 2026-06-01T23:30:00+12:00 --no-send
import "@/lib/jobs/standalone";
import { loadLocalEnv } from "@/scripts/lib/load-env";

loadLocalEnv();

const args = process.argv.slice(2);
const when = args.find((a) => !a.startsWith("--"));
const send = !args.includes("--no-send");
if (!when || !/^\d{4}-\d{2}-\d{2}(T.+)?$/.test(when)) {
  console.error("Usage: npm run clock -- <YYYY-MM-DD | ISO instant> [--no-send]");
  process.exit(2);
}

const { closeDb } = await import("@/db");
const { institution } = await import("@/lib/mail/queries");
const { instantAt } = await import("@/lib/jobs/clock");
const { runReminders } = await import("@/lib/jobs/actions");
const { deliverDueMail } = await import("@/lib/mail/actions");

try {
  const { timeZone } = await institution();
  const now = when.includes("T") ? new Date(when) : instantAt(when, timeZone, 6);
  if (Number.isNaN(now.getTime())) throw new Error(`not a date: ${when}`);
  const report = await runReminders({ now });
  console.log(`Permit job as of ${now.toISOString()} (${report.today} in ${report.timeZone}):`);
  console.log(`  schedule: ${report.schedule.join(", ")} days before expiry`);
  console.log(`  expired now: ${report.expired.length}`);
  for (const q of report.queued)
    console.log(`  queued ${q.kind} reminder for ${q.number} (due ${q.dueDate}) → ${q.to.join(", ")}`);
  for (const a of report.inspections)
    console.log(`  queued inspection reminder for ${a.name} (due ${a.dueOn}) → ${a.to.join(", ")}`);
  if (report.queued.length === 0) console.log("  no new reminders (each is sent once per permit, kind and due date)");
  if (send) {
    // Sent with the real time: the clock moves the permit job, not the outbox's back-off.
    const sent = await deliverDueMail();
    console.log(`  outbox: ${sent.sent.length} sent, ${sent.retry.length} to retry, ${sent.failed.length} failed`);
  }
} finally {
  await closeDb();
}
