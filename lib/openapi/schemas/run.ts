import { z } from "zod";
import { RUN_STATUSES } from "@/db/queries/runs";
import { documented } from "../documented";
import { analysisResultSchema } from "./analysis-result";
import { designSpecSchema, flagSchema, isoTime, nullableIsoTime, pageOf, partsSchema, rowId, topologySchema, userId } from "./common";
import { tweakSchema } from "./tweak";

export const runStatusSchema = z.enum(RUN_STATUSES).describe("queued → running → done or failed.");
const verdictSchema = z.enum(["pass", "fail", "inconclusive"]).nullable().describe("pass, fail, inconclusive (no rule failed but one could not be judged on the capture: shown as \"cannot judge\"), or null when the design has no spec or the run is not done.");

const runSummaryShape = {
  id: rowId,
  buildId: rowId,
  status: runStatusSchema,
  createdAt: isoTime,
  finishedAt: nullableIsoTime,
  createdByName: z.string(),
  originalFilename: z.string(),
  sizeBytes: z.int(),
  channel: z.string().nullable(),
  tweakId: rowId.nullable().describe("The tweak this capture follows."),
  predictedHz: z.number().nullable().describe("Predicted frequency from the as-built values when the capture was logged, Hz."),
  measuredHz: z.number().nullable().describe("Measured fundamental, Hz (results.frequencyHz)."),
  frequencyUncertaintyHz: z.number().nullable(),
  driftPpm: z.number().nullable().describe("(measured − predicted) / predicted, ppm."),
  impliedExtraCapacitanceF: z.number().nullable().describe("Extra parallel capacitance that would explain the drift, F (signed)."),
  fundamentalVpk: z.number().nullable(),
  thdPercent: z.number().nullable(),
  worstHarmonicDbc: z.number().nullable(),
  verdict: verdictSchema,
  error: z.string().nullable().describe("Why the analysis failed, when status is failed."),
  duplicateOfRunId: rowId.nullable().describe("Set when this run keeps a second copy of a file already logged."),
  withdrawal: z
    .object({ withdrawnAt: isoTime, withdrawnBy: userId, reason: z.string() })
    .nullable()
    .describe("Set while the run is withdrawn: it stays in the logbook but leaves the lab's figures, the build's trend and verdict and the comparison's default run."),
};

export const runSummarySchema = documented(z.object(runSummaryShape), { refId: "RunSummary" });
export const runPageSchema = pageOf(runSummarySchema, "RunPage");

/** POST /runs/{id}/withdrawal. */
export const runWithdrawalSchema = documented(
  z.object({ runId: rowId, buildId: rowId, withdrawnAt: isoTime, withdrawnBy: userId, withdrawnByName: z.string(), reason: z.string() }),
  { refId: "RunWithdrawal", description: "A withdrawn run: who withdrew it, when and why." },
);

export const runAcceptedSchema = documented(z.object({ id: rowId, status: runStatusSchema }), {
  refId: "RunAccepted",
  description: "The run created (or queued again); poll GET /api/v1/runs/{id} until status is done or failed.",
});

const bandSchema = z.object({ minHz: z.number(), maxHz: z.number() }).nullable();

export const runSnapshotSchema = documented(
  z.object({
    topology: topologySchema,
    designId: rowId,
    designRevisionId: rowId,
    designRevision: z.int(),
    parts: partsSchema,
    extraCapacitanceF: z.number().nullable(),
    windings: z.enum(["aiding", "opposing"]).nullable(),
    predictedHz: z.number().nullable(),
    lEffH: z.number().nullable(),
    cEffF: z.number().nullable(),
    worstCase: bandSchema,
    statistical: bandSchema,
    spec: designSpecSchema,
    specRevision: z
      .int()
      .optional()
      .meta({ description: "The design revision `spec` comes from after a re-analysis, which judges the run by the spec as it is then." }),
    predictionError: z.string().optional(),
  }),
  {
    refId: "RunSnapshot",
    description:
      "The build as it was when the capture was logged, with the prediction; the run is judged against `spec` (the upload's, or the current one at the last re-analysis).",
  },
);

export const specCheckSchema = documented(
  z.object({
    rule: z.string(),
    passed: z.boolean().describe("True only when the outcome is pass."),
    outcome: z.enum(["pass", "fail", "cannot-judge"]).optional().describe("Absent on checks stored before cannot-judge existed."),
    advice: z.string().nullable().optional().describe("For cannot-judge: what would let the rule be judged."),
    measured: z.number().nullable(),
    limit: z.number().nullable(),
    margin: z.number().nullable(),
    unit: z.string(),
    message: z.string(),
  }),
  { refId: "SpecCheck" },
);

export const driftSchema = documented(
  z.object({
    predictedHz: z.number(),
    measuredHz: z.number(),
    hz: z.number().describe("measured − predicted, Hz."),
    percent: z.number(),
    ppm: z.number(),
    impliedExtraCapacitanceF: z.number(),
    impliedInductanceErrorH: z.number(),
    impliedInductanceErrorPercent: z.number(),
    direction: z.enum(["above", "below", "on"]),
    explanation: z.string(),
  }),
  { refId: "Drift", description: "Measured against predicted, explained as an implied stray capacitance or inductance error." },
);

/** GET /runs/{id}. */
export const runSchema = documented(
  z.object({
    ...runSummaryShape,
    updatedAt: isoTime,
    startedAt: nullableIsoTime,
    sha256: z.string().regex(/^[0-9a-f]{64}$/).describe("SHA-256 of the capture file, hex."),
    probeAttenuation: z.number(),
    supplyV: z.number().nullable(),
    temperatureC: z.number().nullable(),
    note: z.string(),
    designRevisionId: rowId,
    snapshot: runSnapshotSchema,
    engineVersion: z.string().nullable(),
    inRecordDriftPpm: z.number().nullable(),
    results: analysisResultSchema.nullable(),
    checks: z.array(specCheckSchema).describe("Every spec check of the latest analysis, passed ones included."),
    flags: z.array(flagSchema),
    drift: driftSchema.nullable(),
    buildLabel: z.string(),
    designId: rowId,
    projectId: rowId,
    tweak: tweakSchema.nullable(),
  }),
  { refId: "Run" },
);

export const runPlotSchema = documented(
  z.object({
    status: runStatusSchema,
    plot: z
      .object({ waveform: z.record(z.string(), z.unknown()), spectrum: z.record(z.string(), z.unknown()), harmonicMarkers: z.array(z.record(z.string(), z.unknown())) })
      .loose()
      .nullable()
      .describe("Waveform envelope, spectrum in dBV and harmonic markers; null until done."),
    specLimitDbc: z.number().nullable().describe("The spec's harmonic limit line, dBc."),
  }),
  { refId: "RunPlot" },
);

