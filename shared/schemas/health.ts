import { z } from "zod";

/** GET /api/health: 200 with db "up", or 503 with db "down". */
export const HealthStatus = z.object({
  status: z.enum(["ok", "degraded"]),
  db: z.enum(["up", "down"]),
  version: z.string(),
});
export type HealthStatus = z.infer<typeof HealthStatus>;
