// A second server of the same production build with some settings changed (for example
// PASSWORD_SIGN_IN=false), on a port the system gives out, so it meets no other copy's or checkout's
// ports. Same database and identity provider as the first; stopped with stop().
import { spawn } from "node:child_process";
import net from "node:net";
import { nextCommand } from "@/scripts/lib/next-server.mjs";

export type SecondServer = { base: string; stop: () => void };

export async function startSecondServer(settings: Record<string, string>): Promise<SecondServer> {
  const port = await new Promise<number>((resolve) => {
    const probe = net.createServer().listen(0, "127.0.0.1", () => {
      const { port } = probe.address() as net.AddressInfo;
      probe.close(() => resolve(port));
    });
  });
  const base = `http://127.0.0.1:${port}`;
  const [cmd, args] = nextCommand(["start", "-p", String(port), "-H", "127.0.0.1"]);
  const server = spawn(cmd, args, {
    env: {
      ...process.env,
      NODE_ENV: "production",
      NEXT_DIST_DIR: process.env.TEST_DIST_DIR ?? ".next",
      APP_URL: base,
      AUTH_URL: base,
      WORKER_IN_APP: "false",
      ...settings,
    },
    detached: true,
    stdio: "ignore",
  });
  const stop = () => {
    if (server.pid) {
      try {
        process.kill(-server.pid, "SIGTERM");
      } catch {
        // already gone
      }
    }
  };
  const deadline = Date.now() + 90_000; // a cold start on a busy 2-core machine
  for (;;) {
    try {
      if ((await fetch(`${base}/api/health/live`)).ok) break;
    } catch {
      // not up yet
    }
    if (Date.now() > deadline) {
      stop();
      throw new Error("the second server did not start");
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  return { base, stop };
}
