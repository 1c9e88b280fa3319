// `npm run worker`: the job worker as its own process (outbox sending and the daily permit job), for
// deployments that set WORKER_IN_APP=false on their app servers. Any number may run at once.
// Stops cleanly on SIGINT/SIGTERM (jobs in progress finish first, up to 10 s).
import "@/lib/jobs/standalone";
import { loadLocalEnv } from "@/scripts/lib/load-env";

loadLocalEnv();

const { env } = await import("@/lib/env");
env();
const { startWorker } = await import("@/lib/jobs/worker");
const worker = await startWorker();
console.log(
  `[worker] running (pid ${process.pid}); outbox via ${env().MAIL_TRANSPORT} ${env().SMTP_HOST}:${env().SMTP_PORT}`,
);

let stopping = false;
async function stop(signal: string) {
  if (stopping) return;
  stopping = true;
  console.log(`[worker] ${signal}: stopping`);
  await worker.stop();
  const { closeDb } = await import("@/db");
  await closeDb();
  process.exit(0);
}
process.on("SIGINT", () => void stop("SIGINT"));
process.on("SIGTERM", () => void stop("SIGTERM"));
