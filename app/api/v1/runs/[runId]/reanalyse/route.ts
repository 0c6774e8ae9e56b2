import { apiHandler } from "@/lib/http/api-handler";
import { reanalyseRun } from "@/lib/logbook/runs";

export const dynamic = "force-dynamic";

type Params = { runId: string };

/** Queue a finished run for analysis again (technician and above): 202 `{id, status}`; 409 while it is queued or running. */
export const POST = apiHandler<Params>({ action: "run:reanalyse" }, async (_request, context, user) => {
  const { runId } = await context.params;
  const run = await reanalyseRun({ user }, runId);
  return Response.json({ id: run.id, status: run.status }, { status: 202, headers: { location: `/api/v1/runs/${run.id}` } });
});
