// Runs once when a server instance starts: validate the environment so a misconfigured deployment
// fails at start-up with the variable's name, not on the first request.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { env } = await import("@/lib/env");
  env();
}
