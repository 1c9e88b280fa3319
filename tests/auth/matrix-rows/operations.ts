import { everyone, type MatrixRow } from "../matrix-kit";

// Operations: the load balancer's health checks answer everyone alike and reveal nothing per user.
export const OPERATIONS_ROWS: MatrixRow[] = [
  { route: "/api/health/live", method: "GET", expect: everyone(200) },
  { route: "/api/health/ready", method: "GET", expect: everyone(200) },
];
