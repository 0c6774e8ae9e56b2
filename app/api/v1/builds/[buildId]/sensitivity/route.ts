import { apiHandler } from "@/lib/http/api-handler";
import { getBuildSensitivity } from "@/lib/logbook/sensitivity";

export const dynamic = "force-dynamic";

type Params = { buildId: string };

/**
 * The build's figures across its runs: per build state (a part tweak starts a new one) the pushing (Hz/V, ppm/V
 * and amplitude V/V), the temperature coefficient (ppm/K) beside the parts' prediction, each with its 1σ and run
 * count or "not measured" with the reason; the repeat sets' run-to-run Allan deviation and χ² flag; excluded runs.
 */
export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { buildId } = await context.params;
  return Response.json(await getBuildSensitivity(user, buildId));
});
