import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { runWithdrawalInputSchema } from "@/lib/validations/run-withdrawal";
import { REQUEST_EXAMPLES } from "../examples";
import { jsonBody, jsonResponse, locationHeader, pathId, registerOperation } from "../operation";
import { runAcceptedSchema, runPlotSchema, runSchema, runWithdrawalSchema } from "../schemas/run";

const runParams = z.object({ runId: pathId("run") });

export function registerRunPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/runs/{runId}",
    operationId: "getRun",
    tag: "Runs",
    summary: "Get a run",
    description:
      "Status (queued, running, done, failed), the analysis `results` (the object `npm run -s analyze -- FILE --json` " +
      "prints; null until done), the predicted frequency from the snapshot, drift in ppm, the implied extra " +
      "capacitance, the verdict, flags and every spec check. `error` says why, when the analysis failed.",
    action: "read",
    params: runParams,
    responses: { 200: jsonResponse(runSchema, "The run.") },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/runs/{runId}/reanalyse",
    operationId: "reanalyseRun",
    tag: "Runs",
    summary: "Analyse a run again",
    description: "Queues a finished run for analysis again (e.g. after the engine improved); its result replaces the current one.",
    action: "run:reanalyse",
    params: runParams,
    responses: { 202: jsonResponse(runAcceptedSchema, "Queued again.", locationHeader("the run")) },
    problems: { 409: "The run is queued or being analysed already." },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/runs/{runId}/withdrawal",
    operationId: "withdrawRun",
    tag: "Runs",
    summary: "Withdraw a run from the figures",
    description:
      "Marks the run withdrawn with a reason (a wrong probe setting, the wrong board on the bench). Nothing is deleted: " +
      "the run stays in its build's lists, marked withdrawn, but the lab's layout figures, the build's drift trend and " +
      "verdict and the comparison's default run leave it out. Audited; DELETE restores it.",
    action: "run:withdraw",
    params: runParams,
    body: jsonBody(runWithdrawalInputSchema, "RunWithdrawalInput", { example: REQUEST_EXAMPLES.withdrawRun }),
    responses: { 200: jsonResponse(runWithdrawalSchema, "The run is withdrawn.") },
    problems: { 409: "The run is withdrawn already." },
  });
  registerOperation(registry, {
    method: "delete",
    path: "/api/v1/runs/{runId}/withdrawal",
    operationId: "restoreRun",
    tag: "Runs",
    summary: "Restore a withdrawn run",
    description: "Puts a withdrawn run back into the figures. Audited, with the withdrawal it undoes.",
    action: "run:withdraw",
    params: runParams,
    responses: { 204: { description: "The run counts again." } },
    problems: { 409: "The run is not withdrawn." },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/runs/{runId}/capture",
    operationId: "downloadRunCapture",
    tag: "Runs",
    summary: "Download the raw capture",
    description: "A redirect to a presigned GET (valid 5 minutes) that downloads the file unchanged under its original name. `curl -L` follows it.",
    action: "read",
    params: runParams,
    responses: { 302: { description: "Redirect to the file in object storage.", headers: z.object({ Location: z.string().describe("The presigned URL.") }) } },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/runs/{runId}/plot",
    operationId: "getRunPlot",
    tag: "Runs",
    summary: "Plot data of a run",
    description: "Waveform envelope, spectrum in dBV and harmonic markers as the run page draws them; null until done.",
    action: "read",
    params: runParams,
    responses: { 200: jsonResponse(runPlotSchema, "The plot data.") },
  });
}
