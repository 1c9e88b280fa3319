// Runs once when a server instance starts: validate the environment so a misconfigured deployment
// fails at start-up with the variable's name, not on the first request; then, when WORKER_IN_APP is
// set (the default of `npm start`), start the job worker (mail outbox, daily permit job) in this
// process. Never during `next build`, and never in the edge runtime.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { env } = await import("@/lib/env");
  const config = env();
  const { peerHeaderInstalled } = await import("@/lib/http/client-ip");
  if (
    config.NODE_ENV === "production" &&
    process.env.NEXT_PHASE !== "phase-production-build" &&
    !peerHeaderInstalled()
  ) {
    // Without it a client's own X-Forwarded-For would pass for its address (lib/http/client-ip.ts).
    throw new Error(
      "Start the web server with the peer-address preload: `npm run serve` " +
        "(node --import ./scripts/lib/peer-address.mjs node_modules/next/dist/bin/next start).",
    );
  }
  if (process.env.NEXT_PHASE === "phase-production-build") return;
  // Behind a load balancer (`npm run cluster`, docs/deploy.md) the server drains before it stops:
  // readiness answers 503 first, requests in flight finish, then the worker and the pool close.
  if (process.env.NEXT_MANUAL_SIG_HANDLE) {
    const { installGracefulShutdown } = await import("@/lib/ops/lifecycle");
    installGracefulShutdown({
      drainMs: config.SHUTDOWN_DRAIN_MS,
      timeoutMs: config.SHUTDOWN_TIMEOUT_MS,
      onStop: async () => {
        const running = (globalThis as { benchclearWorker?: Promise<{ stop(): Promise<void> }> }).benchclearWorker;
        if (running) await (await running.catch(() => null))?.stop();
        const { closeDb } = await import("@/db");
        await closeDb();
      },
    });
  }
  if (!config.WORKER_IN_APP) return;
  const { startWorkerOnce } = await import("@/lib/jobs/worker");
  // The web server keeps serving when the worker cannot start (the database is still coming up):
  // mail waits in the outbox, and the start is tried again with a growing delay (5 s up to 5 min).
  const start = (retryMs: number) => {
    startWorkerOnce()
      .then(() => console.log("[worker] started in the web server process"))
      .catch((error) => {
        console.error(
          `[worker] could not start, retrying in ${retryMs / 1000} s:`,
          error instanceof Error ? error.message : error,
        );
        setTimeout(() => start(Math.min(retryMs * 2, 300_000)), retryMs).unref();
      });
  };
  start(5_000);
}
