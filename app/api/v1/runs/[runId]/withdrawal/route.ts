import { apiHandler } from "@/lib/http/api-handler";
import { readJson } from "@/lib/logbook/http";
import { restoreRun, withdrawRun } from "@/lib/logbook/run-withdrawal";

export const dynamic = "force-dynamic";

type Params = { runId: string };

/**
 * Withdraws a run from the figures (technician and above): `{reason}` required. 200 with the withdrawal; 409 when
 * it is withdrawn already. Nothing is deleted: the run stays in its build's lists, marked withdrawn.
 */
export const POST = apiHandler<Params>({ action: "run:withdraw" }, async (request, context, user) => {
  const { runId } = await context.params;
  const body = await readJson(request);
  const w = await withdrawRun({ user }, runId, body);
  return Response.json({ runId: w.runId, buildId: w.buildId, withdrawnAt: w.withdrawnAt, withdrawnBy: w.withdrawnBy, withdrawnByName: w.withdrawnByName, reason: w.reason });
});

/** Restores a withdrawn run into the figures (technician and above): 204; 409 when it is not withdrawn. */
export const DELETE = apiHandler<Params>({ action: "run:withdraw" }, async (_request, context, user) => {
  const { runId } = await context.params;
  await restoreRun({ user }, runId);
  return new Response(null, { status: 204 });
});
