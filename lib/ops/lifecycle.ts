import "server-only";
import dc from "node:diagnostics_channel";
import type { Server, ServerResponse } from "node:http";

// The server's life between "up" and "gone", for deployments behind a load balancer. On SIGTERM a
// server first reports "not ready" (GET /api/health/ready → 503) while it keeps serving, so the
// balancer's health check takes it out of rotation; after SHUTDOWN_DRAIN_MS it stops accepting
// connections, waits for the requests in flight to finish (at most SHUTDOWN_TIMEOUT_MS), stops the
// in-process job worker, closes its database pool and exits. Active only when NEXT_MANUAL_SIG_HANDLE
// is set (as `npm run cluster` does): otherwise Next.js's own handler closes the server at once.
//
// State lives on globalThis: instrumentation and route handlers are separate bundles in Next.js, so a
// module-level variable would not be shared between them.

type Lifecycle = { draining: boolean; inFlight: number; servers: Set<Server>; installed: boolean };

const globalForLifecycle = globalThis as unknown as { benchclearLifecycle?: Lifecycle };

function state(): Lifecycle {
  globalForLifecycle.benchclearLifecycle ??= { draining: false, inFlight: 0, servers: new Set(), installed: false };
  return globalForLifecycle.benchclearLifecycle;
}

export function isDraining(): boolean {
  return state().draining;
}

type Options = { drainMs: number; timeoutMs: number; onStop: () => Promise<void> };

/** Counts requests in flight (node:http's diagnostics channels) and handles SIGTERM and SIGINT once. */
export function installGracefulShutdown(options: Options): void {
  const s = state();
  if (s.installed) return;
  s.installed = true;
  dc.subscribe("http.server.request.start", (message) => {
    const { server, response } = message as { server: Server; response: ServerResponse };
    s.servers.add(server);
    s.inFlight++;
    // "close" comes for every response, finished or abandoned by its client ("finish" only for the first).
    response.once("close", () => {
      s.inFlight = Math.max(0, s.inFlight - 1);
    });
  });

  const shutdown = async (signal: NodeJS.Signals) => {
    if (s.draining) return;
    s.draining = true;
    console.log(`[lifecycle] ${signal}: not ready; draining for ${options.drainMs} ms`);
    await sleep(options.drainMs);
    // Stop accepting; Node closes idle keep-alive connections and lets busy ones finish.
    for (const server of s.servers) server.close();
    const deadline = Date.now() + options.timeoutMs;
    while (s.inFlight > 0 && Date.now() < deadline) await sleep(50);
    if (s.inFlight > 0) console.error(`[lifecycle] ${s.inFlight} request(s) still running at the deadline`);
    for (const server of s.servers) server.closeAllConnections();
    try {
      await options.onStop();
    } catch (error) {
      console.error("[lifecycle] clean-up failed:", error instanceof Error ? error.message : error);
    }
    console.log("[lifecycle] stopped");
    process.exit(0);
  };
  process.once("SIGTERM", () => void shutdown("SIGTERM"));
  process.once("SIGINT", () => void shutdown("SIGINT"));
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}
