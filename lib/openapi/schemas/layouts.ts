import { z } from "zod";
import { BUILD_KINDS, BUILD_STATUSES } from "@/db/queries/builds";
import { documented } from "../documented";
import { isoTime, nullableIsoTime, rowId, topologySchema } from "./common";

const constructionSchema = documented(
  z.object({
    key: z.string().describe("breadboard, perfboard, other, pcb, or pcb:<revision in lower case>; pass it back as ?construction=."),
    name: z.string().describe("The construction in words, e.g. “PCB rev B”."),
    kind: z.enum(BUILD_KINDS),
    revision: z.string().describe("The PCB revision as first written; empty for the other kinds."),
  }),
  { refId: "Construction" },
);

const robustSummarySchema = documented(
  z.object({
    count: z.int().describe("How many steady builds the summary rests on."),
    median: z.number().nullable(),
    scaledMad: z.number().nullable().describe("Median absolute deviation × 1.4826: the spread between builds as a standard deviation; null below two builds."),
    min: z.number().nullable(),
    max: z.number().nullable(),
    range: z.number().nullable().describe("max − min."),
  }),
  { refId: "RobustSummary" },
);

const steadyBuildSchema = documented(
  z.object({
    buildId: rowId,
    label: z.string(),
    designId: rowId,
    designName: z.string(),
    projectId: rowId,
    projectName: z.string(),
    typicalF: z.number().describe("The build's implied extra capacitance, F: mean of its segment means over runs without trust warnings."),
    spreadF: z.number().describe("Largest minus smallest segment mean, F."),
    runCount: z.int(),
    segmentCount: z.int().describe("Stretches between applied tweaks that hold a run."),
    inductanceErrorFraction: z.number().nullable().describe("Mean (f_pred/f_meas)² − 1: the fractional L_eff error that alone would explain the runs."),
  }),
  { refId: "SteadyLayoutBuild" },
);

export const layoutFigureSchema = documented(
  z.object({
    construction: constructionSchema,
    topology: topologySchema,
    strength: z.enum(["trusted", "thin", "none"]).describe("trusted from 5 steady builds, thin below, none without one."),
    candidateBuildCount: z.int().describe("Builds with runs without trust warnings, steady or not."),
    capacitanceF: robustSummarySchema.describe("The implied extra capacitance across the steady builds, F."),
    inductanceErrorFraction: robustSummarySchema.describe("Over the steady builds that run above their prediction: the fractional L_eff error."),
    builds: z.array(steadyBuildSchema),
  }),
  { refId: "LayoutFigure" },
);

export const layoutFigureListSchema = documented(z.object({ items: z.array(layoutFigureSchema) }), { refId: "LayoutFigureList" });

const bandSchema = z.object({ minHz: z.number(), maxHz: z.number() });

const predictionFiguresSchema = documented(
  z.object({
    predictedHz: z.number(),
    cEffF: z.number().describe("C_eff with every parallel capacitance, F."),
    lEffH: z.number(),
    worstCase: bandSchema.describe("Every part at a tolerance corner (and, calibrated, the lab figure ± 3 spreads)."),
    statistical: bandSchema.describe("Central 99.7 % of simulated builds (calibrated: widened in quadrature by the lab's spread)."),
  }),
  { refId: "PredictionFigures" },
);

export const calibratedPredictionSchema = documented(
  z.object({
    designId: rowId,
    construction: constructionSchema,
    asDesigned: predictionFiguresSchema.nullable(),
    asBuilt: predictionFiguresSchema.nullable().describe("As it will likely measure on the construction here; null without a lab figure."),
    labCapacitanceF: z.number().nullable().describe("The lab's median implied capacitance for the construction and topology, F."),
    labSpreadF: z.number().nullable().describe("Its scaled MAD between builds, F."),
    shiftHz: z.number().nullable().describe("asBuilt − asDesigned, Hz."),
    figure: z
      .object({ strength: z.enum(["trusted", "thin", "none"]), buildCount: z.int(), buildIds: z.array(rowId) })
      .nullable(),
    error: z.string().nullable().describe("Why there is no calibrated prediction."),
    choices: z.array(
      z.object({ key: z.string(), name: z.string(), strength: z.enum(["trusted", "thin", "none"]), buildCount: z.int() }),
    ),
  }),
  { refId: "CalibratedPrediction" },
);

const comparedRunSchema = documented(
  z.object({
    id: rowId,
    createdAt: isoTime,
    originalFilename: z.string(),
    measuredHz: z.number().nullable(),
    frequencyUncertaintyHz: z.number().nullable(),
    predictedHz: z.number().nullable(),
    worstCase: bandSchema.nullable(),
    statistical: bandSchema.nullable(),
    driftPpm: z.number().nullable(),
    impliedExtraCapacitanceF: z.number().nullable(),
    thdPercent: z.number().nullable(),
    worstHarmonicDbc: z.number().nullable(),
    verdict: z.enum(["pass", "fail", "inconclusive"]).nullable(),
    harmonics: z.array(z.object({ order: z.int(), dBc: z.number() })),
    warningCodes: z.array(z.string()).describe("Trust warnings the analysis raised."),
    withdrawnAt: nullableIsoTime.describe("Set when the chosen run is withdrawn (a default run never is)."),
    chosen: z.boolean().describe("True when the run was chosen with ?runs= rather than the default."),
    stability: z
      .object({
        measured: z.boolean().describe("False when the analysis holds no stability figures (analysed before the engine measured them)."),
        reason: z.string().nullable().describe("Why there are no figures, when there are none."),
        rmsJitterS: z.number().nullable().describe("rms phase jitter, s; null when not measured."),
        jitterReason: z.string().nullable().describe("Why the jitter is not measured."),
        phaseNoise: z.array(z.object({ offsetHz: z.number(), dbcPerHz: z.number(), atFloor: z.boolean().describe("At the capture's noise floor: an upper bound only.") })),
        allan: z.array(z.object({ tauS: z.number(), adev: z.number() })),
      })
      .describe("The run's stability figures as the analysis measured them; missing ones say why, never 0."),
  }),
  { refId: "ComparedRun" },
);

export const buildComparisonSchema = documented(
  z.object({
    items: z.array(
      z.object({
        build: z.object({
          id: rowId,
          label: z.string(),
          kind: z.enum(BUILD_KINDS),
          kindRevision: z.string(),
          status: z.enum(BUILD_STATUSES),
          designId: rowId,
          designName: z.string(),
          topology: topologySchema,
          projectId: rowId,
          projectName: z.string(),
        }),
        construction: z.object({ key: z.string(), name: z.string() }),
        runCount: z.int().describe("Analysed runs that count (withdrawn ones left out)."),
        latestRun: comparedRunSchema.nullable().describe("The compared run: the chosen one, else the newest analysed run that is not withdrawn; null when there is none."),
        runChoices: z
          .array(z.object({ id: rowId, createdAt: isoTime, originalFilename: z.string(), withdrawn: z.boolean() }))
          .describe("Every analysed run of the build, newest first, withdrawn ones marked: the runs ?runs= can choose."),
        offsetHz: z.number().nullable().describe("measured − predicted of the latest run, Hz."),
        trend: z.object({
          verdict: z.enum(["too-few-runs", "untested", "steady", "changing"]),
          typicalF: z.number().nullable(),
          spreadF: z.number(),
          allowanceF: z.number(),
          summary: z.string(),
        }),
      }),
    ),
  }),
  { refId: "BuildComparison" },
);
