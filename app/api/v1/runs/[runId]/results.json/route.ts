import { ConflictError } from "@/lib/errors";
import { apiHandler } from "@/lib/http/api-handler";
import { runJson } from "@/lib/logbook/api-json";
import { getRunView } from "@/lib/logbook/runs";

export const dynamic = "force-dynamic";

type Params = { runId: string };

/**
 * The run's full results as a JSON file to keep: the run as GET /api/v1/runs/{id} gives it (snapshot, engine
 * results, every spec check, flags, drift explanation) with its build, design and project, as an attachment.
 * 409 until the analysis is done.
 */
export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { runId } = await context.params;
  const { run, build, flags, drift, tweak } = await getRunView(user, runId);
  if (run.status !== "done") throw new ConflictError(`Run ${run.id} is ${run.status}; its results can be downloaded once the analysis is done.`);
  const document = {
    format: "tankbook-run-results",
    formatVersion: 1,
    exportedAt: new Date().toISOString(),
    build: { id: build.id, label: build.label, designId: build.designId, designName: build.designName, projectId: build.projectId, projectName: build.projectName },
    tweak,
    run: runJson(run, flags, drift),
  };
  return new Response(JSON.stringify(document, null, 2), {
    headers: {
      "content-type": "application/json; charset=utf-8",
      "content-disposition": `attachment; filename="tankbook-run-${run.id}-results.json"`,
    },
  });
});
