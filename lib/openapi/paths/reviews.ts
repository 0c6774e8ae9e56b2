import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { buildReviewInputSchema, retunePlanSchema, runExportQuerySchema } from "@/lib/validations/review";
import { REQUEST_EXAMPLES } from "../examples";
import { jsonBody, jsonResponse, locationHeader, pathId, registerOperation } from "../operation";
import { flagSchema } from "../schemas/common";
import { buildFollowSchema, projectFollowSchema, retuneSchema, reviewOutcomeSchema } from "../schemas/review";
import { tweakSchema } from "../schemas/tweak";

const buildParams = z.object({ buildId: pathId("build") });
const projectParams = z.object({ projectId: pathId("project") });
// The handlers read only `series` from the retune schema (the build comes from the path).
const retuneSeries = retunePlanSchema.pick({ series: true });

export function registerReviewPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/builds/{buildId}/review",
    operationId: "reviewBuild",
    tag: "Reviews",
    summary: "Accept, reject or reopen a build",
    description: "Rejecting needs a comment; accepting a build whose latest analysed run is flagged needs a reason. The decision is audited.",
    action: "build:review",
    params: buildParams,
    body: jsonBody(buildReviewInputSchema, "BuildReviewInput", { example: REQUEST_EXAMPLES.reviewBuild }),
    responses: { 200: jsonResponse(reviewOutcomeSchema, "The build after the decision.") },
    problems: { 400: "A field failed validation, or a flagged build was accepted without a reason (`fields.reason`)." },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/flags/{flagId}/acknowledge",
    operationId: "acknowledgeFlag",
    tag: "Reviews",
    summary: "Acknowledge a flag",
    action: "flag:acknowledge",
    params: z.object({ flagId: pathId("flag") }),
    responses: { 200: jsonResponse(flagSchema, "The flag, acknowledged.") },
    problems: { 409: "The flag was acknowledged already." },
  });
  for (const [method, summary, operationId] of [
    ["get", "Whether you follow a build", "getBuildFollow"],
    ["put", "Follow a build", "followBuild"],
    ["delete", "Stop following a build", "unfollowBuild"],
  ] as const) {
    registerOperation(registry, {
      method,
      path: "/api/v1/builds/{buildId}/follow",
      operationId,
      tag: "Reviews",
      summary,
      description: method === "get" ? undefined : "Followers get the build's flags by e-mail, as their notification choice allows.",
      action: "read",
      params: buildParams,
      responses: { 200: jsonResponse(buildFollowSchema, "The follow status.") },
    });
  }
  for (const [method, summary, operationId] of [
    ["get", "Whether you follow a project", "getProjectFollow"],
    ["put", "Follow every build of a project", "followProject"],
    ["delete", "Stop following a project", "unfollowProject"],
  ] as const) {
    registerOperation(registry, {
      method,
      path: "/api/v1/projects/{projectId}/follow",
      operationId,
      tag: "Reviews",
      summary,
      action: "read",
      params: projectParams,
      responses: { 200: jsonResponse(projectFollowSchema, "The follow status.") },
    });
  }
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/builds/{buildId}/retune",
    operationId: "getRetuneSuggestion",
    tag: "Reviews",
    summary: "Retune suggestion",
    description: "The single standard-value change that brings the build nearest its target, from its latest analysed run.",
    action: "read",
    params: buildParams,
    query: retuneSeries,
    responses: { 200: jsonResponse(retuneSchema, "The suggestion, or nulls when there is none.") },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/builds/{buildId}/retune",
    operationId: "planRetune",
    tag: "Reviews",
    summary: "Plan the retune as a tweak",
    description: "Logs the suggestion as a planned tweak (201), or returns the one already planned (200). The body is optional.",
    action: "tweak:create",
    params: buildParams,
    body: jsonBody(retuneSeries, "RetunePlanInput", { required: false, example: REQUEST_EXAMPLES.planRetune }),
    responses: {
      201: jsonResponse(tweakSchema, "The planned tweak.", locationHeader("the build's tweak log")),
      200: jsonResponse(tweakSchema, "The same suggestion was planned already."),
    },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/builds/{buildId}/runs.csv",
    operationId: "exportBuildRuns",
    tag: "Reviews",
    summary: "Export a build's runs as CSV",
    description: "Every run that matches the filters (same as the runs list, without paging), newest first; SI units in the headers, ISO 8601 UTC times.",
    action: "read",
    params: buildParams,
    query: runExportQuerySchema,
    responses: {
      200: {
        description: "The CSV file (an attachment).",
        content: { "text/csv": { schema: z.string() } },
        headers: z.object({ "Content-Disposition": z.string() }),
      },
    },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/runs/{runId}/results.json",
    operationId: "downloadRunResults",
    tag: "Runs",
    summary: "Download a run's results as a JSON file",
    description: "The run as GET /api/v1/runs/{id} gives it, with its build and tweak, as an attachment to keep.",
    action: "read",
    params: z.object({ runId: pathId("run") }),
    responses: {
      200: jsonResponse(
        z.object({
          format: z.literal("tankbook-run-results"),
          formatVersion: z.int(),
          exportedAt: z.iso.datetime(),
          build: z.record(z.string(), z.unknown()),
          tweak: z.record(z.string(), z.unknown()).nullable(),
          run: z.record(z.string(), z.unknown()).describe("As GET /api/v1/runs/{runId}."),
        }),
        "The results file.",
      ),
    },
    problems: { 409: "The run is not analysed yet." },
  });
}
