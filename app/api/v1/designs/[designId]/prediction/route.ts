import { apiHandler } from "@/lib/http/api-handler";
import { queryObject } from "@/lib/logbook/http";
import { getDesignCalibration } from "@/lib/logbook/layouts";
import { calibratedViewJson } from "@/lib/logbook/layouts-json";
import { predictionQuerySchema } from "@/lib/validations/layouts";

export const dynamic = "force-dynamic";

type Params = { designId: string };

/** The design's prediction as designed and on a construction of this lab: `?construction=breadboard|pcb:rev B|…`. */
export const GET = apiHandler<Params>({ action: "read" }, async (request, context, user) => {
  const { designId } = await context.params;
  const query = predictionQuerySchema.parse(queryObject(request));
  const view = await getDesignCalibration(user, designId, query.construction ?? null);
  return Response.json(calibratedViewJson(view.design.id, view));
});
