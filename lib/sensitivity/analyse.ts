/**
 * Across the runs of a build: pushing (frequency and amplitude against supply voltage), the temperature coefficient
 * against what the parts' tempcos predict, and run-to-run stability of repeated runs. Pure: no I/O.
 */
import type { OscillatorDesign } from "@/lib/oscillator/design";
import { temperatureShift } from "@/lib/oscillator/tempco";
import { chiSquareSurvival } from "./chi-square";
import { groupRunsByTweaks, repeatRuns, sortRuns } from "./groups";
import type {
  ExcludedRun,
  MeasuredSlope,
  NotMeasured,
  PredictedTempco,
  RepeatSetReport,
  SensitivityPoint,
  SensitivityReport,
  SensitivityRunInput,
  SensitivitySettings,
  SensitivityTweakInput,
  SlopeFigure,
  StateGroupReport,
} from "./types";
import { weightedLinearFit, type WeightedPoint } from "./weighted-fit";

/**
 * Trust warnings under which a run's frequency says nothing about the oscillator's steady tone: no one tone, a
 * second mode or a sub-harmonic (which tone was measured?), a record still starting up or dying away.
 */
export const FREQUENCY_UNJUDGEABLE_WARNINGS: readonly string[] = ["no-dominant-tone", "second-mode", "sub-harmonic", "not-steady"];

/**
 * The bands that make two runs "the same condition" and the test level. A bench supply is set to about 10 mV and
 * a bench thermometer read to about 0.1 K, so ±50 mV and ±0.5 K are a generous "same" (common practice, not a
 * standard); a 1 % test level keeps false alarms rare across the many sets a build collects.
 */
export const DEFAULT_SENSITIVITY_SETTINGS: Omit<SensitivitySettings, "timebasePpm"> = Object.freeze({
  supplyBandV: 0.05,
  temperatureBandK: 0.5,
  testLevel: 0.01,
  minRuns: 3,
});

function iso(value: Date | string): string {
  return (value instanceof Date ? value : new Date(value)).toISOString();
}

function notMeasured(reason: string): NotMeasured {
  return { measured: false, reason };
}

function mean(values: readonly number[]): number {
  return values.reduce((a, b) => a + b, 0) / values.length;
}

function spreadOf(values: readonly number[]): number {
  return values.length ? Math.max(...values) - Math.min(...values) : 0;
}

function fmt(value: number, digits = 3): string {
  return String(Number(value.toPrecision(digits)));
}

/** Why a run cannot take part, or null when it can. */
function exclusionReason(run: SensitivityRunInput): string | null {
  if (run.measuredHz === null || !Number.isFinite(run.measuredHz) || run.measuredHz <= 0) return "no measured frequency";
  const warning = run.warningCodes.find((c) => FREQUENCY_UNJUDGEABLE_WARNINGS.includes(c));
  if (warning) return `its "${warning}" warning leaves the steady frequency unjudgeable`;
  if (!(run.frequencyUncertaintyHz !== null && run.frequencyUncertaintyHz > 0)) return "no frequency uncertainty stored (analysed before it was kept; re-analyse the run)";
  return null;
}

type Usable = SensitivityRunInput & { measuredHz: number; frequencyUncertaintyHz: number };
type Variable = "supply" | "temperature";

const valueOf = (run: Usable, v: Variable) => (v === "supply" ? run.supplyV : run.temperatureC);

interface FitPlan {
  regressors: Variable[];
  runs: Usable[];
  /** Why a variable is not in the fit. */
  missing: Partial<Record<Variable, string>>;
}

/** Which variables vary enough within the group to be fitted, and which runs carry all of them. */
function planFit(group: readonly Usable[], settings: SensitivitySettings): FitPlan {
  const missing: FitPlan["missing"] = {};
  const regressors: Variable[] = [];
  for (const variable of ["supply", "temperature"] as const) {
    const values = group.map((r) => valueOf(r, variable)).filter((v): v is number => v !== null && Number.isFinite(v));
    const band = variable === "supply" ? settings.supplyBandV : settings.temperatureBandK;
    const unit = variable === "supply" ? "V" : "°C";
    const noun = variable === "supply" ? "supply voltage" : "temperature";
    if (values.length === 0) missing[variable] = `no run of this build state records its ${noun}`;
    else if (spreadOf(values) <= 2 * band) missing[variable] = `no spread: every run with a ${noun} is at ${fmt(mean(values), 4)} ${unit} (within ±${band} ${variable === "supply" ? "V" : "K"})`;
    else regressors.push(variable);
  }
  const runs = group.filter((r) => regressors.every((v) => valueOf(r, v) !== null));
  return { regressors, runs, missing };
}

/**
 * One fit of `y` over the plan's regressors, centred on their means so the intercept is the value at the mean
 * condition; returns one figure per regressor.
 */
function fitSlopes(
  plan: FitPlan,
  settings: SensitivitySettings,
  y: (run: Usable) => number | null,
  weighted: boolean,
  relative: boolean,
): Record<Variable, SlopeFigure> {
  const out = {} as Record<Variable, SlopeFigure>;
  for (const v of ["supply", "temperature"] as const) if (plan.missing[v]) out[v] = notMeasured(plan.missing[v]!);
  if (plan.regressors.length === 0) return out;
  const runs = plan.runs.filter((r) => y(r) !== null && Number.isFinite(y(r) as number));
  const needed = Math.max(settings.minRuns, plan.regressors.length + 2);
  const withWhat = plan.regressors.map((v) => (v === "supply" ? "a supply voltage" : "a temperature")).join(" and ");
  if (runs.length < needed) {
    for (const v of plan.regressors) out[v] = notMeasured(`${runs.length} ${runs.length === 1 ? "run has" : "runs have"} ${withWhat}; the fit needs at least ${needed}`);
    return out;
  }
  const centres = plan.regressors.map((v) => mean(runs.map((r) => valueOf(r, v) as number)));
  const points: WeightedPoint[] = runs.map((r) => ({
    y: y(r) as number,
    sigma: weighted ? r.frequencyUncertaintyHz : 1,
    x: plan.regressors.map((v, i) => (valueOf(r, v) as number) - centres[i]),
  }));
  let fit;
  try {
    fit = weightedLinearFit(points);
  } catch {
    for (const v of plan.regressors) out[v] = notMeasured("supply voltage and temperature changed together in these runs, so their effects cannot be told apart");
    return out;
  }
  const dof = fit.degreesOfFreedom;
  // Weighted: widen by √χ²ν when the runs scatter more than their own uncertainties say (the Birge ratio; common
  // practice). Unweighted (no stated σ): the scatter is the only estimate of σ (Bevington & Robinson ch. 6, from memory).
  const chi = fit.reducedChiSquare ?? 0;
  const scale = weighted ? Math.max(1, Math.sqrt(chi)) : Math.sqrt(fit.chiSquare / dof);
  const intercept = fit.coefficients[0];
  const timebase = relative && settings.timebasePpm !== null && settings.timebasePpm > 0 ? (Math.abs(intercept) * settings.timebasePpm) / 1e6 : 0;
  plan.regressors.forEach((v, i) => {
    const slope = fit.coefficients[i + 1];
    const slopeSigma = fit.sigmas[i + 1] * scale;
    const values = runs.map((r) => valueOf(r, v) as number);
    const figure: MeasuredSlope = {
      measured: true,
      slope,
      slopeSigma,
      // ppm of the fitted frequency; the timebase scales slope and frequency alike, so it cancels here.
      ppm: relative ? (slope / intercept) * 1e6 : null,
      ppmSigma: relative ? (slopeSigma / Math.abs(intercept)) * 1e6 : null,
      runs: runs.length,
      reducedChiSquare: weighted ? fit.reducedChiSquare : null,
      sigmaBasis: weighted ? (scale > 1 ? "stated-and-scatter" : "stated") : "scatter",
      intercept,
      interceptSigma: Math.hypot(fit.sigmas[0] * scale, timebase),
      referenceSupplyV: plan.regressors.includes("supply") ? centres[plan.regressors.indexOf("supply")] : null,
      referenceTemperatureC: plan.regressors.includes("temperature") ? centres[plan.regressors.indexOf("temperature")] : null,
      heldConstant: plan.regressors.filter((other) => other !== v).map((other) => (other === "supply" ? "supply voltage" : "temperature")),
      rangeLow: Math.min(...values),
      rangeHigh: Math.max(...values),
    };
    out[v] = figure;
  });
  return out;
}

/**
 * What the parts' tempcos predict, ppm/K, from lib/oscillator's temperatureShift over +1 K, with the range that
 * every tempco's spread allows.
 */
export function predictTempco(design: OscillatorDesign | null): PredictedTempco {
  if (!design) return { predicted: false, reason: "the build state's part values could not be read" };
  const entries = Object.entries(design.parts);
  const partsWithTempco = entries.filter(([, p]) => p.tempcoPpmPerK !== undefined).map(([ref]) => ref);
  const partsWithout = entries.filter(([, p]) => p.tempcoPpmPerK === undefined).map(([ref]) => ref);
  if (partsWithTempco.length === 0) return { predicted: false, reason: "no part of the design has a tempco entered" };
  try {
    const shift = temperatureShift(design, 1);
    return {
      predicted: true,
      ppmPerK: shift.exactFraction * 1e6,
      minPpmPerK: (shift.minHz / shift.nominalHz - 1) * 1e6,
      maxPpmPerK: (shift.maxHz / shift.nominalHz - 1) * 1e6,
      partsWithTempco,
      partsWithout,
    };
  } catch (err) {
    return { predicted: false, reason: err instanceof Error ? err.message : "the model refused these values" };
  }
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/**
 * Run-to-run stability of repeated runs: the Allan (two-sample) deviation of their fractional frequencies in upload
 * order, σ²y = ⟨(y₍ᵢ₊₁₎ − yᵢ)²⟩/2 (IEEE Std 1139 / NIST SP 1065 definition, from memory) at τ = the median spacing,
 * and a χ² test of the scatter against the runs' statistical uncertainties (one scope: the timebase is common to
 * every run and cancels). Flagged when p < the test level.
 */
export function repeatSetStability(runs: readonly Usable[], groupIndex: number, settings: SensitivitySettings): RepeatSetReport {
  const sorted = sortRuns(runs);
  const weights = sorted.map((r) => 1 / r.frequencyUncertaintyHz ** 2);
  const sumW = weights.reduce((a, b) => a + b, 0);
  const meanHz = sorted.reduce((s, r, i) => s + weights[i] * r.measuredHz, 0) / sumW;
  const n = sorted.length;
  const base = {
    groupIndex,
    runIds: sorted.map((r) => r.id),
    supplyV: sorted[0].supplyV,
    temperatureC: sorted[0].temperatureC,
    runs: n,
    meanHz,
    degreesOfFreedom: Math.max(0, n - 1),
  };
  if (n < settings.minRuns) {
    return {
      ...base,
      allanDeviation: null,
      expectedAllanDeviation: null,
      tauS: null,
      scatterPpm: null,
      chiSquare: null,
      reducedChiSquare: null,
      pValue: null,
      flagged: false,
      reason: `${n} repeated ${n === 1 ? "run" : "runs"}; the test needs at least ${settings.minRuns}`,
    };
  }
  const y = sorted.map((r) => r.measuredHz / meanHz - 1);
  let avar = 0;
  let expected = 0;
  const gapsS: number[] = [];
  for (let i = 0; i + 1 < n; i++) {
    avar += (y[i + 1] - y[i]) ** 2;
    expected += (sorted[i].frequencyUncertaintyHz ** 2 + sorted[i + 1].frequencyUncertaintyHz ** 2) / meanHz ** 2;
    gapsS.push((new Date(sorted[i + 1].createdAt).getTime() - new Date(sorted[i].createdAt).getTime()) / 1000);
  }
  avar /= 2 * (n - 1);
  expected /= 2 * (n - 1);
  const chiSquare = sorted.reduce((s, r) => s + ((r.measuredHz - meanHz) / r.frequencyUncertaintyHz) ** 2, 0);
  const pValue = chiSquareSurvival(chiSquare, n - 1);
  const plainMean = mean(sorted.map((r) => r.measuredHz));
  const sd = Math.sqrt(sorted.reduce((s, r) => s + (r.measuredHz - plainMean) ** 2, 0) / (n - 1));
  return {
    ...base,
    allanDeviation: Math.sqrt(avar),
    expectedAllanDeviation: Math.sqrt(expected),
    tauS: median(gapsS),
    scatterPpm: (sd / meanHz) * 1e6,
    chiSquare,
    reducedChiSquare: chiSquare / (n - 1),
    pValue,
    flagged: pValue < settings.testLevel,
    reason: null,
  };
}

/**
 * Every figure across a build's runs.
 *
 * Runs without a frequency, its uncertainty, or with a warning that leaves it unjudgeable
 * ({@link FREQUENCY_UNJUDGEABLE_WARNINGS}) are listed as excluded with the reason. The rest are split into build
 * states at every tweak that changed a part; each state gets its own fits, so no regression mixes two states.
 * Frequency is fitted by weighted least squares (w = 1/σ², σ the capture's statistical 1σ) on supply voltage and
 * temperature together when both vary (each slope then holds the other variable constant), on one alone otherwise.
 *
 * @param runs - the build's analysed runs, any order
 * @param tweaks - the build's tweaks, any order
 * @param options.timebasePpm - the scope's timebase accuracy, for the absolute frequency at the reference point
 * @returns the build states in time order with their figures, the repeat sets and the excluded runs
 * @throws RangeError when a date cannot be read
 */
export function analyseSensitivity(
  runs: readonly SensitivityRunInput[],
  tweaks: readonly SensitivityTweakInput[],
  options: { timebasePpm?: number | null } & Partial<Omit<SensitivitySettings, "timebasePpm">> = {},
): SensitivityReport {
  const settings: SensitivitySettings = { ...DEFAULT_SENSITIVITY_SETTINGS, ...options, timebasePpm: options.timebasePpm ?? null };
  const excluded: ExcludedRun[] = [];
  const usable: Usable[] = [];
  for (const run of sortRuns(runs)) {
    const reason = exclusionReason(run);
    if (reason) excluded.push({ runId: run.id, originalFilename: run.originalFilename, reason });
    else usable.push(run as Usable);
  }

  const stateOf = new Map<string, number>();
  const groups: StateGroupReport[] = groupRunsByTweaks(usable, tweaks, "part").map((group, index) => {
    for (const r of group) stateOf.set(r.id, index);
    const plan = planFit(group, settings);
    const frequency = fitSlopes(plan, settings, (r) => r.measuredHz, true, true);
    const amplitude = fitSlopes(plan, settings, (r) => r.fundamentalVpk, false, false);
    const points: SensitivityPoint[] = group.map((r) => ({
      runId: r.id,
      originalFilename: r.originalFilename,
      createdAt: iso(r.createdAt),
      frequencyHz: r.measuredHz,
      frequencySigmaHz: r.frequencyUncertaintyHz,
      fundamentalVpk: r.fundamentalVpk,
      supplyV: r.supplyV,
      temperatureC: r.temperatureC,
    }));
    return {
      index,
      runIds: group.map((r) => r.id),
      firstRunAt: iso(group[0].createdAt),
      lastRunAt: iso(group[group.length - 1].createdAt),
      points,
      pushing: frequency.supply,
      amplitudePushing: amplitude.supply,
      tempco: frequency.temperature,
      predictedTempco: predictTempco(group[group.length - 1].design),
    };
  });

  const repeatSets: RepeatSetReport[] = [];
  for (const group of groupRunsByTweaks(usable, tweaks, "any")) {
    for (const set of repeatRuns(group, settings.supplyBandV, settings.temperatureBandK)) {
      if (set.length >= 2) repeatSets.push(repeatSetStability(set, stateOf.get(set[0].id) ?? 0, settings));
    }
  }

  return { groups, currentGroupIndex: groups.length ? groups.length - 1 : null, repeatSets, excluded, settings };
}
