import { apiHandler } from "@/lib/http/api-handler";
import { getRunPlot } from "@/lib/logbook/runs";

export const dynamic = "force-dynamic";

type Params = { runId: string };

/**
 * Plot data of an analysed run: `{status, plot, specLimitDbc}` where `plot` is the engine's waveform envelope,
 * spectrum in dBV and harmonic markers (null until done) and `specLimitDbc` the spec's harmonic limit line.
 */
export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { runId } = await context.params;
  const body = await getRunPlot(user, runId);
  // A finished run's plot never changes until it is re-analysed; let the browser keep it briefly.
  return Response.json(body, { headers: { "cache-control": body.status === "done" ? "private, max-age=60" : "no-store" } });
});
