import { runJson } from "@/lib/logbook/api-json";
import { apiReadHandler } from "@/lib/logbook/http";
import { getRunViewForRequest } from "@/lib/logbook/runs";

export const dynamic = "force-dynamic";

type Params = { runId: string };

/**
 * A run: `{id, buildId, status (queued|running|done|failed), createdAt, results, predictedHz, driftPpm,
 * impliedExtraCapacitanceF, verdict (pass|fail|null), flags, error, …}`. `results` is the object
 * `npm run -s analyze -- FILE --json` prints, null until done; `checks` holds every spec check, `drift` the
 * measured-versus-predicted explanation.
 */
export const GET = apiReadHandler<Params>(async (request, context) => {
  const { runId } = await context.params;
  const { view } = await getRunViewForRequest(request, runId);
  return Response.json({ ...runJson(view.run, view.flags, view.drift), buildLabel: view.build.label, designId: view.build.designId, projectId: view.build.projectId, tweak: view.tweak });
});
