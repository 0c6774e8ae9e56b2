import { apiHandler } from "@/lib/http/api-handler";
import { tweakJson } from "@/lib/logbook/api-json";
import { getBuild } from "@/lib/logbook/builds";
import { applyPlannedTweak } from "@/lib/logbook/tweaks";

export const dynamic = "force-dynamic";

type Params = { buildId: string; tweakId: string };

/**
 * Apply a planned tweak now that its part is fitted (technician and above): the part takes the planned value in
 * the as-built values. 200 with the tweak; 404 when the tweak is not this build's; 409 when it is applied already.
 */
export const POST = apiHandler<Params>({ action: "tweak:create" }, async (_request, context, user) => {
  const { buildId, tweakId } = await context.params;
  const build = await getBuild(user, buildId);
  const tweak = await applyPlannedTweak({ user }, tweakId, build.id);
  return Response.json(tweakJson(tweak));
});
