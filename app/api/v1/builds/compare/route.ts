import { apiHandler } from "@/lib/http/api-handler";
import { queryObject } from "@/lib/logbook/http";
import { getBuildComparison } from "@/lib/logbook/layouts";
import { comparedBuildJson } from "@/lib/logbook/layouts-json";
import { compareQuerySchema } from "@/lib/validations/layouts";

export const dynamic = "force-dynamic";

/**
 * Two or more builds side by side: `{items}`; `?ids=<id>,<id>`, and `&runs=<id>,…` to choose the run of some builds
 * (default: each build's newest analysed run that is not withdrawn).
 */
export const GET = apiHandler({ action: "read" }, async (request, _context, user) => {
  const { ids, runs } = compareQuerySchema.parse(queryObject(request));
  const builds = await getBuildComparison(user, ids, runs ?? []);
  return Response.json({ items: builds.map(comparedBuildJson) });
});
