import { serviceHealth } from "@/server/services/health";
import { json, route } from "@/server/http";

export const dynamic = "force-dynamic";

/** Public on purpose: says only whether each service answers, nothing about data. */
export const GET = route(async () => {
  const health = await serviceHealth();
  return json(health, health.ok ? 200 : 503);
});
