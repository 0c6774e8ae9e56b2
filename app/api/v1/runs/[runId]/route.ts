import { apiHandler } from "@/lib/http/api-handler";
import { runJson } from "@/lib/logbook/api-json";
import { getRunView } from "@/lib/logbook/runs";

export const dynamic = "force-dynamic";

type Params = { runId: string };

/**
 * A run: `{id, buildId, status (queued|running|done|failed), createdAt, results, predictedHz, driftPpm,
 * impliedExtraCapacitanceF, verdict (pass|fail|null), flags, error, …}`. `results` is the object
 * `npm run -s analyze -- FILE --json` prints, null until done; `checks` holds every spec check, `drift` the
 * measured-versus-predicted explanation.
 */
export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { runId } = await context.params;
  const view = await getRunView(user, runId);
  return Response.json({ ...runJson(view.run, view.flags, view.drift), buildLabel: view.build.label, designId: view.build.designId, projectId: view.build.projectId, tweak: view.tweak });
});
