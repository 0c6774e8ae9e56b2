import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { jsonResponse, pathId, registerOperation } from "../operation";
import { tweakSchema } from "../schemas/tweak";

/** Applying a planned tweak once its part is fitted at the bench. */
export function registerTweakApplyPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/builds/{buildId}/tweaks/{tweakId}/apply",
    operationId: "applyPlannedTweak",
    tag: "Builds",
    summary: "Apply a planned tweak",
    description:
      "The part is fitted: the planned value becomes the build's as-built value and the tweak is no longer planned. " +
      "Its “from” value is the as-built value at this moment. No body.",
    action: "tweak:create",
    params: z.object({ buildId: pathId("build"), tweakId: pathId("tweak") }),
    responses: { 200: jsonResponse(tweakSchema, "The tweak, now applied.") },
    problems: { 409: "The tweak is applied already." },
  });
}
