import { apiHandler } from "@/lib/http/api-handler";
import { queryObject } from "@/lib/logbook/http";
import { getBuildComparison } from "@/lib/logbook/layouts";
import { comparedBuildJson } from "@/lib/logbook/layouts-json";
import { compareQuerySchema } from "@/lib/validations/layouts";

export const dynamic = "force-dynamic";

/** Two or more builds side by side (latest analysed run of each): `{items}`; `?ids=<id>,<id>`. */
export const GET = apiHandler({ action: "read" }, async (request, _context, user) => {
  const { ids } = compareQuerySchema.parse(queryObject(request));
  const builds = await getBuildComparison(user, ids);
  return Response.json({ items: builds.map(comparedBuildJson) });
});
