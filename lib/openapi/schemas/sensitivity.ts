import { z } from "zod";
import { documented } from "../documented";
import { rowId } from "./common";

const notMeasured = z.object({ measured: z.literal(false), reason: z.string().describe("Why the figure could not be measured.") });

const measuredSlope = z.object({
  measured: z.literal(true),
  slope: z.number().describe("Slope in the figure's unit: Hz/V (pushing), Hz/K (tempco) or V/V (amplitude)."),
  slopeSigma: z.number().describe("Its 1σ, same unit."),
  ppm: z.number().nullable().describe("Slope relative to the fitted frequency: ppm/V or ppm/K; null for amplitude."),
  ppmSigma: z.number().nullable(),
  runs: z.number().int().describe("Runs in the fit."),
  reducedChiSquare: z.number().nullable().describe("χ²/ν of the weighted fit; null when unweighted or without a degree of freedom."),
  sigmaBasis: z
    .enum(["stated", "stated-and-scatter", "scatter"])
    .describe("σ from the runs' stated uncertainties, those widened by √χ²ν, or (amplitude) the scatter about the line alone."),
  heldConstant: z.array(z.string()).describe("The other variable the fit held constant because it varied too."),
  intercept: z.number().describe("Fitted value at the reference point (Hz or V)."),
  interceptSigma: z.number().describe("Its absolute 1σ (the scope's timebase included for a frequency)."),
  referenceSupplyV: z.number().nullable(),
  referenceTemperatureC: z.number().nullable(),
  rangeLow: z.number().describe("Lowest value of the figure's variable among the fitted runs (V or °C)."),
  rangeHigh: z.number(),
});

const slopeFigure = z.union([measuredSlope, notMeasured]);

const predictedTempco = z.union([
  z.object({
    predicted: z.literal(true),
    ppmPerK: z.number().describe("What the parts' tempcos predict at their nominal values, ppm/K."),
    minPpmPerK: z.number().describe("Lowest over every tempco's spread."),
    maxPpmPerK: z.number(),
    partsWithTempco: z.array(z.string()),
    partsWithout: z.array(z.string()).describe("Parts with no tempco entered (taken as not moving)."),
  }),
  z.object({ predicted: z.literal(false), reason: z.string() }),
]);

const point = z.object({
  runId: rowId,
  originalFilename: z.string(),
  createdAt: z.string(),
  frequencyHz: z.number(),
  frequencySigmaHz: z.number().describe("The capture's statistical 1σ."),
  fundamentalVpk: z.number().nullable(),
  supplyV: z.number().nullable(),
  temperatureC: z.number().nullable(),
});

const group = z.object({
  index: z.number().int().describe("0 for the build as first made, then one per part change."),
  runIds: z.array(rowId),
  firstRunAt: z.string(),
  lastRunAt: z.string(),
  points: z.array(point),
  pushing: slopeFigure.describe("Frequency against supply voltage."),
  amplitudePushing: slopeFigure.describe("Fundamental amplitude against supply voltage (V/V)."),
  tempco: slopeFigure.describe("Frequency against temperature."),
  predictedTempco,
});

const repeatSet = z.object({
  groupIndex: z.number().int(),
  runIds: z.array(rowId),
  supplyV: z.number().nullable(),
  temperatureC: z.number().nullable(),
  runs: z.number().int(),
  meanHz: z.number().describe("Weighted mean frequency, Hz."),
  allanDeviation: z.number().nullable().describe("Two-sample (Allan) deviation of the runs' fractional frequencies in upload order."),
  expectedAllanDeviation: z.number().nullable().describe("What the runs' own uncertainties alone would give."),
  tauS: z.number().nullable().describe("Median time between consecutive runs, s."),
  scatterPpm: z.number().nullable(),
  chiSquare: z.number().nullable(),
  degreesOfFreedom: z.number().int(),
  reducedChiSquare: z.number().nullable(),
  pValue: z.number().nullable(),
  flagged: z.boolean().describe("True when the scatter is larger than the stated uncertainties explain at the test level."),
  reason: z.string().nullable().describe("Why the test was not made."),
});

export const buildSensitivitySchema = documented(
  z.object({
    buildId: rowId,
    groups: z.array(group).describe("Build states in time order; a tweak that changed a part starts a new one."),
    currentGroupIndex: z.number().int().nullable().describe("The state of the build as it stands; null with no usable run."),
    repeatSets: z.array(repeatSet).describe("Repeated runs under one condition with no tweak between them."),
    excluded: z.array(z.object({ runId: rowId, originalFilename: z.string(), reason: z.string() })).describe("Runs left out, with the reason."),
    settings: z.object({
      supplyBandV: z.number(),
      temperatureBandK: z.number(),
      testLevel: z.number(),
      timebasePpm: z.number().nullable(),
      minRuns: z.number().int(),
    }),
  }),
  { refId: "BuildSensitivity", description: "Pushing, temperature coefficient and run-to-run stability across a build's analysed runs." },
);
