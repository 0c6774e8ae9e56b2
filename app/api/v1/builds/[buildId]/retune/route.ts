import { clientIp } from "@/lib/auth/client-ip";
import { NotFoundError } from "@/lib/errors";
import { apiHandler } from "@/lib/http/api-handler";
import { tweakJson } from "@/lib/logbook/api-json";
import { isId } from "@/lib/logbook/context";
import { queryObject, readJson } from "@/lib/logbook/http";
import { getRetuneSuggestion, planRetuneTweak } from "@/lib/logbook/review";
import type { ESeriesName } from "@/lib/oscillator/e-series";
import { retunePlanSchema } from "@/lib/validations/review";

export const dynamic = "force-dynamic";

type Params = { buildId: string };

/**
 * The retune suggestion from the build's latest analysed run, `?series=E12` (default): `{runId, suggestion}` with
 * the part, from/to values (SI), predicted f0 and its bands, β and start-up gain before and after, whether the target
 * is reachable (else the nearest reachable frequency) and the run's trust warnings; `{runId: null, suggestion: null}`
 * when there is none.
 */
export const GET = apiHandler<Params>({ action: "read" }, async (request, context) => {
  const { buildId } = await context.params;
  if (!isId(buildId)) throw new NotFoundError("The build");
  const { series } = retunePlanSchema.parse({ ...queryObject(request), buildId });
  const retune = await getRetuneSuggestion(buildId, { series: series as ESeriesName | undefined });
  if (!retune) return Response.json({ runId: null, suggestion: null, trustWarnings: [] });
  const { design: _design, ...suggestion } = retune.suggestion;
  return Response.json({ runId: retune.run.id, suggestion, trustWarnings: retune.trustWarnings });
});

/** Log the suggestion as a planned tweak (technician and above), JSON `{series?}`: 201 with the tweak (200 when already planned). */
export const POST = apiHandler<Params>({ action: "tweak:create" }, async (request, context, user) => {
  const { buildId } = await context.params;
  const hasBody = (request.headers.get("content-length") ?? "0") !== "0";
  const body = hasBody ? ((await readJson(request)) as Record<string, unknown>) : {};
  const { series } = retunePlanSchema.parse({ ...body, buildId });
  const { tweak, created } = await planRetuneTweak(user, { buildId, series: series as ESeriesName | undefined }, { ip: clientIp(request.headers) });
  return Response.json(tweakJson(tweak), { status: created ? 201 : 200, headers: { location: `/api/v1/builds/${buildId}/tweaks` } });
});
