import { apiHandler } from "@/lib/http/api-handler";
import { buildJson, flagJson, tweakJson } from "@/lib/logbook/api-json";
import { getBuildView } from "@/lib/logbook/builds";

export const dynamic = "force-dynamic";

type Params = { buildId: string };

/** A build: as-built parts, the prediction for them, its tweaks (oldest first) and open flags. */
export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { buildId } = await context.params;
  const view = await getBuildView(user, buildId, { limit: 1 });
  return Response.json({
    ...buildJson(view.build, view.prediction),
    topology: view.design.topology,
    predictionError: view.predictionError,
    tweaks: view.tweaks.map(tweakJson),
    openFlags: view.flags.map(flagJson),
  });
});
