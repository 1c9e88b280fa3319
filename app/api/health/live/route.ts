// GET /api/health/live — anyone (a load balancer, an orchestrator): 200 while this process can answer
// at all. It touches neither the database nor storage, so a database outage does not get every app
// server restarted; readiness (/api/health/ready) is what takes a server out of rotation.
import { route } from "@/lib/http/route";

export const dynamic = "force-dynamic";

export const GET = route({ access: "public" }, async () => {
  return Response.json({ status: "live" }, { headers: { "Cache-Control": "no-store" } });
});
