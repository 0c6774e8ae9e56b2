import { apiHandler } from "@/lib/http/api-handler";
import { queryObject } from "@/lib/logbook/http";
import { getRunExcerpt } from "@/lib/logbook/run-excerpt";
import { runExcerptQuerySchema } from "@/lib/validations/run-excerpt";

export const dynamic = "force-dynamic";

type Params = { runId: string };

/**
 * Raw samples of an analysed run's channel in a time window: `?fromS=&toS=` (seconds on the capture's axis) →
 * `{channel, sampleRateHz, timeS, volts}`, at most 5000 samples (a wider window is a 400 naming its count).
 */
export const GET = apiHandler<Params>({ action: "read" }, async (request, context, user) => {
  const { runId } = await context.params;
  const excerpt = await getRunExcerpt(user, runId, runExcerptQuerySchema.parse(queryObject(request)));
  // A finished run's samples never change; the chart asks again for the same window as it pans back.
  return Response.json(excerpt, { headers: { "cache-control": "private, max-age=300" } });
});
