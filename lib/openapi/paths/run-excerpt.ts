import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { EXCERPT_MAX_SAMPLES, runExcerptQuerySchema } from "@/lib/validations/run-excerpt";
import { documented } from "../documented";
import { jsonResponse, pathId, registerOperation } from "../operation";

const runExcerptSchema = documented(
  z.object({
    channel: z.string().describe("The analysed channel's name."),
    sampleRateHz: z.number().describe("The capture's sample rate, S/s."),
    timeS: z.array(z.number()).describe("Time of each sample, s, on the capture's own axis."),
    volts: z.array(z.number()).describe("Each sample, V at the circuit (the run's probe attenuation applied)."),
  }),
  { refId: "RunExcerpt" },
);

/** The raw samples behind a deep zoom of the waveform. */
export function registerRunExcerptPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/runs/{runId}/excerpt",
    operationId: "getRunExcerpt",
    tag: "Runs",
    summary: "Raw samples of a run in a time window",
    description:
      `The analysed channel's samples from fromS to toS (inclusive), read from the stored capture: at most ${EXCERPT_MAX_SAMPLES} ` +
      "samples, so ask for a window that narrow (the waveform chart does once its zoom shows fewer samples than the envelope has points).",
    action: "read",
    params: z.object({ runId: pathId("run") }),
    query: runExcerptQuerySchema,
    responses: { 200: jsonResponse(runExcerptSchema, "The samples in the window.") },
    problems: { 409: "The run is not analysed yet." },
  });
}
