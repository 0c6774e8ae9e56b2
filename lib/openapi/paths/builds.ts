import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { TOPOLOGIES } from "@/lib/oscillator";
import { idempotencyKeySchema, runListQuerySchema, runMetadataSchema } from "@/lib/validations/run";
import { tweakInputSchemaFor } from "@/lib/validations/tweak";
import { documented } from "../documented";
import { REQUEST_EXAMPLES } from "../examples";
import { duplicateCapture, jsonBody, jsonResponse, locationHeader, pathId, registerOperation } from "../operation";
import { timebaseInputSchema } from "@/lib/validations/timebase";
import { buildDetailSchema, buildSchema } from "../schemas/build";
import { runAcceptedSchema, runPageSchema } from "../schemas/run";
import { tweakPageSchema, tweakSchema } from "../schemas/tweak";

const buildParams = z.object({ buildId: pathId("build") });

/** The multipart upload: the run metadata fields exactly as the handler validates them, plus the file. */
const runUploadSchema = documented(
  runMetadataSchema.extend({
    file: documented(z.string(), {
      description: "The capture: a CSV (.csv, .txt or .tsv) as the scope saved it. Streamed to storage as it arrives.",
      openapi: { contentMediaType: "text/csv" },
    }),
  }),
  { refId: "RunUpload" },
);

export function registerBuildPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/builds/{buildId}",
    operationId: "getBuild",
    tag: "Builds",
    summary: "Get a build",
    description: "As-built parts, the prediction for them, the tweak log and open flags.",
    action: "read",
    params: buildParams,
    responses: { 200: jsonResponse(buildDetailSchema, "The build.") },
  });
  registerOperation(registry, {
    method: "patch",
    path: "/api/v1/builds/{buildId}",
    operationId: "setBuildTimebase",
    tag: "Builds",
    summary: "Set the scope timebase accuracy",
    description:
      "`{timebasePpm}`: the ± ppm accuracy of the scope's timebase on this bench (0–10000), or null to clear it. It is root-sum-squared into the absolute uncertainty of the build's frequencies; a frequency rule inside its limit by less than it is cannot judge. Verdicts already stored change at the next analysis or re-analysis.",
    action: "build:create",
    params: buildParams,
    body: jsonBody(timebaseInputSchema, "TimebaseInput", { example: REQUEST_EXAMPLES.setBuildTimebase }),
    responses: { 200: jsonResponse(buildSchema, "The build.") },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/builds/{buildId}/tweaks",
    operationId: "listBuildTweaks",
    tag: "Builds",
    summary: "List a build's tweaks",
    description: "Oldest first, all on one page (`nextCursor` is always null: a build's log is short).",
    action: "read",
    params: buildParams,
    responses: { 200: jsonResponse(tweakPageSchema, "The tweak log.") },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/builds/{buildId}/tweaks",
    operationId: "logTweak",
    tag: "Builds",
    summary: "Log a tweak",
    description:
      "A part's new value (“3n9”, “10 µH” or an SI number) and/or a note. An applied change updates the as-built " +
      "values at once; `planned: true` only records the intent (e.g. a retune to try next).",
    action: "tweak:create",
    params: buildParams,
    // The body's shape is the same for every topology; only how the value is read (F or H) depends on it.
    body: jsonBody(tweakInputSchemaFor(TOPOLOGIES[0]), "TweakInput", { example: REQUEST_EXAMPLES.logTweak }),
    responses: { 201: jsonResponse(tweakSchema, "The tweak logged.", locationHeader("the build's tweak log")) },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/builds/{buildId}/runs",
    operationId: "listBuildRuns",
    tag: "Runs",
    summary: "List a build's runs",
    description: "Newest first. Filter by verdict (`none` = no verdict), status and time (`from`, `to`, ISO 8601).",
    action: "read",
    params: buildParams,
    query: runListQuerySchema,
    responses: { 200: jsonResponse(runPageSchema, "A page of runs.") },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/builds/{buildId}/runs",
    operationId: "uploadRun",
    tag: "Runs",
    summary: "Upload a capture",
    description:
      "multipart/form-data with the CSV in `file` and the optional fields below. The file streams to object storage " +
      "as it arrives (never held in memory), the build's as-built values and prediction are snapshotted with the run, " +
      "and the analysis is queued: poll GET /api/v1/runs/{id} until `status` is done or failed. " +
      "Send an Idempotency-Key to make retries safe: a retry with the same key answers 200 with the first run, " +
      "also while the first is still running; the same key with another file or other details is a 422.",
    action: "run:upload",
    params: buildParams,
    headers: z.object({
      "Idempotency-Key": documented(idempotencyKeySchema, {
        description: "Any unique string per upload (a UUID): a retry with the same key returns the first run instead of a second one.",
        example: "bench3-2026-12-01T09:30:00Z-C2-3n9",
      }).optional(),
    }),
    body: {
      required: true,
      content: { "multipart/form-data": { schema: runUploadSchema, encoding: { file: { contentType: "text/csv, text/plain, application/octet-stream" } } } },
    },
    responses: {
      201: jsonResponse(runAcceptedSchema, "The run created and queued for analysis.", locationHeader("the run")),
      200: jsonResponse(
        runAcceptedSchema,
        "A retry with an Idempotency-Key already used: the first run.",
        z.object({ Location: z.string(), "Idempotent-Replayed": z.literal("true") }),
      ),
    },
    problems: {
      400: "A field failed validation, there is no `file` part, or the tweak is not one of this build's.",
      409: duplicateCapture("The same file (SHA-256) is already logged on this build; `existingRunId` names it. Send keepDuplicate=true to keep a copy."),
      413: "The file (or the announced Content-Length) is over the capture limit, UPLOAD_LIMIT_BYTES (500 MB unless configured).",
      415: "The request is not multipart/form-data, or the file is not a CSV by name or type.",
      422: "The Idempotency-Key was already used for a different upload (another file, build or details); send a new key.",
    },
  });
}
