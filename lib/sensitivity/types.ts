import type { OscillatorDesign } from "@/lib/oscillator/design";

/** One run of a build, as the sensitivity figures need it (db/queries/sensitivity.ts returns these). */
export interface SensitivityRunInput {
  id: string;
  createdAt: Date | string;
  originalFilename: string;
  /** Null when the analysis gave no frequency. */
  measuredHz: number | null;
  /** The capture's statistical 1σ, Hz; null on runs analysed before it was stored. */
  frequencyUncertaintyHz: number | null;
  fundamentalVpk: number | null;
  supplyV: number | null;
  temperatureC: number | null;
  /** Trust warning codes of the analysis. */
  warningCodes: readonly string[];
  /** The design as built when the run was logged (its snapshot); null when it could not be read. */
  design: OscillatorDesign | null;
}

/** A tweak of the build; planned ones changed nothing and are ignored. */
export interface SensitivityTweakInput {
  id: string;
  createdAt: Date | string;
  /** Null for a note-only tweak (no part changed). */
  partRef: string | null;
  planned: boolean;
}

/** A figure that could not be measured, and why (never a 0 or a pass). */
export interface NotMeasured {
  measured: false;
  reason: string;
}

/** A slope measured by weighted least squares. */
export interface MeasuredSlope {
  measured: true;
  /** Slope in the figure's absolute unit (Hz/V, Hz/K or V/V). */
  slope: number;
  /** Its 1σ in the same unit (scaled by √χ²ν when the scatter exceeds the stated uncertainties; see `scaledByScatter`). */
  slopeSigma: number;
  /** Slope relative to the fitted frequency, ppm per unit (ppm/V, ppm/K); null for amplitude. */
  ppm: number | null;
  ppmSigma: number | null;
  /** Runs in the fit. */
  runs: number;
  /** χ²/ν of the fit against the stated uncertainties; null when the fit has no degree of freedom or is unweighted. */
  reducedChiSquare: number | null;
  /**
   * Where slopeSigma comes from: the runs' stated uncertainties; those widened by √χ²ν because the runs scatter more
   * than they say; or the scatter about the line alone (amplitude, which has no stated uncertainty).
   */
  sigmaBasis: "stated" | "stated-and-scatter" | "scatter";
  /** The other variable the fit held constant (it varied too), e.g. ["temperature"] for a pushing figure. */
  heldConstant: string[];
  /** The fitted value at the reference point (mean supply and temperature of the fit): Hz or V. */
  intercept: number;
  /** Its absolute 1σ (with the scope's timebase for a frequency). */
  interceptSigma: number;
  /** The reference point of the intercept (mean of the fitted runs). */
  referenceSupplyV: number | null;
  referenceTemperatureC: number | null;
  /** Lowest and highest value of this figure's variable among the fitted runs (for the fitted line's extent). */
  rangeLow: number;
  rangeHigh: number;
}

export type SlopeFigure = MeasuredSlope | NotMeasured;

/** What the parts' tempcos predict for the build state (lib/oscillator/tempco.ts). */
export type PredictedTempco =
  | { predicted: true; ppmPerK: number; minPpmPerK: number; maxPpmPerK: number; partsWithTempco: string[]; partsWithout: string[] }
  | { predicted: false; reason: string };

/** One point of a scatter chart: a fitted run. */
export interface SensitivityPoint {
  runId: string;
  originalFilename: string;
  createdAt: string;
  frequencyHz: number;
  frequencySigmaHz: number;
  fundamentalVpk: number | null;
  supplyV: number | null;
  temperatureC: number | null;
}

/** The runs of one build state: no part changed between them. */
export interface StateGroupReport {
  /** 0 for the build as first made, 1 after the first part change, … */
  index: number;
  runIds: string[];
  firstRunAt: string;
  lastRunAt: string;
  points: SensitivityPoint[];
  /** Frequency against supply voltage (pushing), with temperature held in the fit when it also varied. */
  pushing: SlopeFigure;
  /** Fundamental amplitude against supply voltage (V/V), unweighted. */
  amplitudePushing: SlopeFigure;
  /** Frequency against temperature, with supply held in the fit when it also varied. */
  tempco: SlopeFigure;
  predictedTempco: PredictedTempco;
}

/** Repeated runs under one condition (no tweak between them, supply and temperature within the bands). */
export interface RepeatSetReport {
  groupIndex: number;
  runIds: string[];
  supplyV: number | null;
  temperatureC: number | null;
  runs: number;
  /** Weighted mean frequency, Hz. */
  meanHz: number;
  /** Allan (two-sample) deviation of the runs' fractional frequencies; null below 3 runs. */
  allanDeviation: number | null;
  /** What the runs' own uncertainties alone would give for it. */
  expectedAllanDeviation: number | null;
  /** Median time between consecutive runs, s (the τ of the Allan deviation; runs are not evenly spaced). */
  tauS: number | null;
  /** Standard deviation of the runs' frequencies, ppm of the mean. */
  scatterPpm: number | null;
  chiSquare: number | null;
  degreesOfFreedom: number;
  reducedChiSquare: number | null;
  /** Probability of at least this χ² if the stated uncertainties were the whole story. */
  pValue: number | null;
  /** True when pValue is below the test level: the scatter is larger than the uncertainties explain. */
  flagged: boolean;
  /** Why the test was not made, when it was not. */
  reason: string | null;
}

export interface ExcludedRun {
  runId: string;
  originalFilename: string;
  reason: string;
}

export interface SensitivityReport {
  groups: StateGroupReport[];
  /** The group of the build as it stands (the latest state with runs); null with no usable run. */
  currentGroupIndex: number | null;
  repeatSets: RepeatSetReport[];
  excluded: ExcludedRun[];
  /** The bands and level the figures used, so every screen can state them. */
  settings: SensitivitySettings;
}

export interface SensitivitySettings {
  /** Supply voltages within ± this count as the same condition, V. */
  supplyBandV: number;
  /** Temperatures within ± this count as the same condition, K. */
  temperatureBandK: number;
  /** The chi-square test's level (probability of a false flag). */
  testLevel: number;
  /** The scope's timebase accuracy, ± ppm; in the intercepts only (a common scale error leaves ppm slopes alone). */
  timebasePpm: number | null;
  /** Fewest runs for a slope or a repeat set. */
  minRuns: number;
}
