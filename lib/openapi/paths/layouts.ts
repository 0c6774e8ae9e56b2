import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { layoutsQuerySchema } from "@/lib/validations/layouts";
import { documented } from "../documented";
import { jsonResponse, pathId, registerOperation } from "../operation";
import { buildComparisonSchema, calibratedPredictionSchema, layoutFigureListSchema } from "../schemas/layouts";

// The comparison and prediction schemas in lib/validations turn text into ids and constructions; the document
// shows the text a caller sends.
const predictionQuery = z.object({
  construction: documented(z.string().optional(), {
    description: "breadboard, perfboard, other, pcb or pcb:<revision> (e.g. pcb:rev B); default: the construction with the most steady builds on the design's topology.",
    example: "breadboard",
  }),
});
const compareQuery = z.object({
  ids: documented(z.string(), { description: "Two to eight build ids, comma-separated, in the order to show.", example: "3f2b8c1e-5d4a-4e6b-9a7c-1d2e3f4a5b6c,8a1d2c3b-4e5f-4a6b-8c7d-9e0f1a2b3c4d" }),
  runs: documented(z.string().optional(), {
    description:
      "Optional: run ids, comma-separated, at most one per build, to compare instead of each build's default run (its newest analysed run that is not withdrawn). A chosen run may be withdrawn; it is shown marked.",
    example: "5c6d7e8f-1a2b-4c3d-9e8f-7a6b5c4d3e2f",
  }),
});

export function registerLayoutPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/layouts",
    operationId: "listLayoutFigures",
    tag: "Builds",
    summary: "What the lab's constructions add",
    description:
      "Per construction kind (PCBs per revision) and topology: the implied extra capacitance of the builds whose value held across their " +
      "tweaks, over runs without trust warnings and not withdrawn — median, scaled MAD (× 1.4826), count and range — with the builds behind each figure. " +
      "A figure on fewer than 5 steady builds is `thin`.",
    action: "read",
    query: layoutsQuerySchema,
    responses: { 200: jsonResponse(layoutFigureListSchema, "The figures.") },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/designs/{designId}/prediction",
    operationId: "getCalibratedPrediction",
    tag: "Designs",
    summary: "Predict a design as designed and as built here",
    description:
      "The current revision's prediction, and the same with the lab's figure for a construction added as a parallel capacitance, " +
      "the bands widened by the spread between builds.",
    action: "read",
    params: z.object({ designId: pathId("design") }),
    query: predictionQuery,
    responses: { 200: jsonResponse(calibratedPredictionSchema, "Both predictions.") },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/builds/compare",
    operationId: "compareBuilds",
    tag: "Builds",
    summary: "Compare builds",
    description:
      "Two or more builds of one design or of several: the chosen run of each (by default its newest analysed run that is not withdrawn) " +
      "against its prediction, THD and harmonic levels, the stability figures where the analysis measured them, the runs that can be " +
      "chosen, and the implied-capacitance trend across its tweaks (withdrawn runs left out).",
    action: "read",
    query: compareQuery,
    responses: { 200: jsonResponse(buildComparisonSchema, "The builds, in the order asked for.") },
    problems: { 404: "One of the builds does not exist." },
  });
}
