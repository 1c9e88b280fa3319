// GET /api/health/ready — anyone (the load balancer's health check): 200 when this server may take
// requests (database and storage answer, not shutting down), else 503 with Retry-After. The body names
// each check as ok or failing, never the error.
import { route } from "@/lib/http/route";
import { readiness } from "@/lib/ops/health";

export const dynamic = "force-dynamic";

export const GET = route({ access: "public" }, async () => {
  const result = await readiness();
  return Response.json(
    { status: result.status, checks: result.checks },
    {
      status: result.ready ? 200 : 503,
      headers: { "Cache-Control": "no-store", ...(result.ready ? {} : { "Retry-After": "5" }) },
    },
  );
});
