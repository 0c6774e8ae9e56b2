import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { jsonResponse, pathId, registerOperation } from "../operation";
import { buildSensitivitySchema } from "../schemas/sensitivity";

export function registerSensitivityPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/builds/{buildId}/sensitivity",
    operationId: "getBuildSensitivity",
    tag: "Builds",
    summary: "Get a build's pushing, temperature coefficient and run-to-run stability",
    description:
      "Weighted least squares (w = 1/σ², σ each capture's statistical frequency 1σ) of frequency on supply voltage and temperature, per build state: " +
      "a tweak that changed a part starts a new state, so no fit mixes two. When both vary, each slope holds the other constant. σ is widened by √χ²ν " +
      "when the runs scatter more than their uncertainties say. A figure with fewer than 3 runs or no spread in its variable is `measured: false` with " +
      "the reason. Repeated runs (no tweak between them, supply within ±`settings.supplyBandV` and temperature within ±`settings.temperatureBandK`) get " +
      "their Allan deviation and a χ² test at `settings.testLevel`. Runs with no frequency or its uncertainty, or with a no-dominant-tone, second-mode, " +
      "sub-harmonic or not-steady warning, are listed in `excluded`.",
    action: "read",
    params: z.object({ buildId: pathId("build") }),
    responses: { 200: jsonResponse(buildSensitivitySchema, "The build's figures across its runs.") },
  });
}
