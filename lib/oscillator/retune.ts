/**
 * The next tweak: which single standard-value part change brings the predicted frequency closest to a target,
 * taking the capacitance implied by a measurement as real.
 */

import { assertValidDesign, nominalValues, parallelCapacitanceF, TOPOLOGY_PARTS, type OscillatorDesign } from "./design";
import { analyseDrift } from "./drift";
import { preferredValuesBetween, type ESeriesName } from "./e-series";
import { frequencyFromValues, tankModel } from "./topologies";
import { statisticalBand, worstCaseBand, type FrequencyBand, type StatisticalOptions } from "./tolerance";
import { assertWithinLimit, limitProblem, LIMITS } from "./limits";
import { formatEngineering } from "./units";

/** Candidates span three decades either side of the fitted value; a bigger jump is a redesign, not a tweak. */
const SEARCH_DECADES = 3;

/** A rise of the minimum gain to start beyond this ratio is worth a warning (5 % is within any stage's spread). */
export const STARTUP_WARNING_RATIO = 1.05;

/** The range one part may take in a retune: three decades either side, inside the bench limits. */
function valueRange(kind: "capacitance" | "inductance", currentSi: number): { lowSi: number; highSi: number } {
  const limit = kind === "capacitance" ? LIMITS.capacitanceF : LIMITS.inductanceH;
  const span = 10 ** SEARCH_DECADES;
  return { lowSi: Math.max(currentSi / span, limit.min), highSi: Math.min(currentSi * span, limit.max) };
}

function listWords(refs: string[]): string {
  return refs.length <= 1 ? refs.join("") : `${refs.slice(0, -1).join(", ")} or ${refs[refs.length - 1]}`;
}

function startupWarningText(part: string, unit: "F" | "H", fromSi: number, toSi: number, before: { beta: number; gain: number }, after: { beta: number; gain: number }): string | null {
  if (!(after.gain > before.gain * STARTUP_WARNING_RATIO)) return null;
  const v = (x: number) => formatEngineering(x, unit, 3, { trimZeros: true });
  const n = (x: number) => String(Number(x.toPrecision(3)));
  return (
    `${part} ${v(fromSi)} → ${v(toSi)} moves the feedback fraction β from ${n(before.beta)} to ${n(after.beta)} and raises the ` +
    `minimum gain to start from ${n(before.gain)} to ${n(after.gain)} (×${n(after.gain / before.gain)}): less start-up margin, so check ` +
    "the amplifier has that gain to spare, or retune with another part"
  );
}

function frequencyWith(design: OscillatorDesign, ref: string, valueSi: number): number | null {
  try {
    return frequencyFromValues(
      design.topology,
      { ...nominalValues(design), [ref]: valueSi },
      parallelCapacitanceF(design),
      design.windings,
    );
  } catch {
    // A negative calibration can leave C_eff at or below 0 for small candidates: no such build exists.
    return null;
  }
}

/** Parts that can be swapped for a standard value: every L and C, never the coupling M or k. */
export function retunableParts(design: OscillatorDesign): string[] {
  return Object.keys(design.parts).filter((ref) => {
    const role = TOPOLOGY_PARTS[design.topology][ref];
    return role !== undefined && role.kind !== "coupling" && ref !== "M";
  });
}

/**
 * The exact value of one part that makes the predicted f0 equal the target (bisection in log space; f0 falls as
 * any L or C rises).
 *
 * @param design - validated first; its extra and calibration capacitance are kept.
 * @param ref - the part to solve for (an L or C).
 * @param targetHz - wanted f0, Hz, above 0.
 * @returns the value in SI units, or null when no value within six decades of the current one reaches the target
 *   (a Clapp's C3 cannot push f0 below the Colpitts limit of C1 and C2, for example).
 * @throws RangeError when the design is invalid, `ref` is not a retunable part, or `targetHz` is not above 0.
 */
export function solvePartValue(design: OscillatorDesign, ref: string, targetHz: number): number | null {
  assertValidDesign(design);
  if (!retunableParts(design).includes(ref)) {
    throw new RangeError(`part ${ref} cannot be retuned in this ${design.topology} design (choose one of ${retunableParts(design).join(", ")})`);
  }
  assertWithinLimit("frequencyHz", targetHz, "the target frequency");
  const current = design.parts[ref].valueSi;
  let lo = Math.log(current) - 6 * Math.LN10;
  let hi = Math.log(current) + 6 * Math.LN10;
  const fLo = frequencyWith(design, ref, Math.exp(lo));
  const fHi = frequencyWith(design, ref, Math.exp(hi));
  if (fHi === null || fHi > targetHz || (fLo !== null && fLo < targetHz)) return null;
  for (let i = 0; i < 200 && hi - lo > 1e-13; i++) {
    const mid = (lo + hi) / 2;
    const f = frequencyWith(design, ref, Math.exp(mid));
    if (f === null || f > targetHz) lo = mid;
    else hi = mid;
  }
  return Math.exp((lo + hi) / 2);
}

export interface RetuneOptions {
  /** Wanted frequency, Hz. */
  targetHz: number;
  /** Measured frequency, Hz; when given, the capacitance it implies is taken as real. */
  measuredHz?: number;
  /**
   * A signed parallel capacitance to take as real instead of the one `measuredHz` implies, F: the lab's figure for
   * the build's construction (the calibrated model), when the retune should aim as the lab's builds measure.
   */
  calibrationCapacitanceF?: number;
  /** Series the new part comes from; default E12. */
  series?: ESeriesName;
  /** Only change this part; default: the best over every capacitor. */
  part?: string;
  /** Also consider the inductors when no part is named; default false, a capacitor is the usual bench swap. */
  includeInductors?: boolean;
  /** Options for the statistical band of the result. */
  statistical?: StatisticalOptions;
  /**
   * How far from the target still counts as on target, Hz (the spec's frequency tolerance). Without it the
   * suggestion never reports "on target".
   */
  targetToleranceHz?: number;
}

export interface RetuneSuggestion {
  part: string;
  unit: "F" | "H";
  fromSi: number;
  toSi: number;
  /** Same as fromSi/toSi when the part is a capacitor; null for an inductor. */
  fromF: number | null;
  toF: number | null;
  /** Same as fromSi/toSi when the part is an inductor; null for a capacitor. */
  fromH: number | null;
  toH: number | null;
  /** The exact value that would hit the target, or null if none can. */
  idealSi: number | null;
  /** False when the current value is already the closest choice. */
  changed: boolean;
  targetHz: number;
  /** Predicted f0 after the change, calibration included. */
  predictedHz: number;
  errorHz: number;
  errorPercent: number;
  /** Feedback fraction and minimum start-up gain after the change (a divider capacitor moves them). */
  feedbackFraction: number | null;
  minGain: number | null;
  /** The same two before the change, for comparison. */
  feedbackFractionBefore: number | null;
  minGainBefore: number | null;
  /**
   * Set when the change raises the minimum gain to start by more than {@link STARTUP_WARNING_RATIO}: the start-up
   * margin shrinks (a Colpitts C2 15 → 27 nF takes β from C1/C2 to about half). Null otherwise.
   */
  startupWarning: string | null;
  /** f0 with the current values, calibration included (the measured frequency when there is one), Hz. */
  currentHz: number;
  /** True when `currentHz` is within the target tolerance given: no tweak is needed. */
  onTarget: boolean;
  /**
   * Whether any single part considered, moved anywhere within three decades and the bench limits, can bring f0 to
   * the target. When false the suggestion is only the closest Tankbook found, and `nearestReachableHz` says how
   * close any such change can get.
   */
  reachable: boolean;
  /** The reachable f0 nearest the target, Hz, when the target is not reachable; null when it is. */
  nearestReachableHz: number | null;
  /** The span of f0 the parts considered can reach, Hz. */
  reachableBand: FrequencyBand;
  /** Why the target cannot be reached, in words; null when it can. */
  unreachableReason: string | null;
  series: ESeriesName;
  /** The signed capacitance taken from the measurement, F (0 without one). */
  calibrationCapacitanceF: number;
  worstCase: FrequencyBand;
  statistical: FrequencyBand;
  /** The design after the change, calibration included, ready for more calculations. */
  design: OscillatorDesign;
}

/**
 * Finds the single standard-value change that brings the predicted f0 closest to a target.
 *
 * @param design - the design as built; validated first.
 * @param options - target, optional measurement, series and part.
 * @returns the change, the resulting predicted f0 (Hz) and its worst-case and Monte Carlo bands (the new part keeps
 *   the old part's tolerance).
 * @throws RangeError when the design is invalid, the target or measurement is not above 0, or the part named
 *   cannot be retuned.
 */
export function suggestRetune(design: OscillatorDesign, options: RetuneOptions): RetuneSuggestion {
  assertValidDesign(design);
  const { targetHz } = options;
  const series = options.series ?? "E12";
  assertWithinLimit("frequencyHz", targetHz, "the target frequency");
  if (options.measuredHz !== undefined) assertWithinLimit("frequencyHz", options.measuredHz, "the measured frequency");
  const candidates = retunableParts(design);
  if (options.part !== undefined && !candidates.includes(options.part)) {
    throw new RangeError(`part ${options.part} cannot be retuned in this ${design.topology} design (choose one of ${candidates.join(", ")})`);
  }
  const capacitors = candidates.filter((ref) => TOPOLOGY_PARTS[design.topology][ref].kind === "capacitance");
  const refs = options.part !== undefined ? [options.part] : options.includeInductors ? candidates : capacitors;

  if (options.calibrationCapacitanceF !== undefined && !Number.isFinite(options.calibrationCapacitanceF)) {
    throw new RangeError(`the calibration capacitance must be a finite number of F; got ${options.calibrationCapacitanceF}`);
  }
  const calibrationCapacitanceF =
    options.calibrationCapacitanceF ?? (options.measuredHz === undefined ? 0 : analyseDrift(design, options.measuredHz).impliedExtraCapacitanceF);
  const calibrated: OscillatorDesign = {
    ...design,
    calibrationCapacitanceF: (design.calibrationCapacitanceF ?? 0) + calibrationCapacitanceF,
  };

  let best: { ref: string; valueSi: number; hz: number; error: number; step: number } | null = null;
  for (const ref of refs) {
    const current = design.parts[ref].valueSi;
    const kind = TOPOLOGY_PARTS[design.topology][ref].kind === "capacitance" ? "capacitance" : "inductance";
    const { lowSi, highSi } = valueRange(kind, current);
    const values = [current, ...preferredValuesBetween(lowSi, highSi, series)];
    for (const valueSi of values) {
      const hz = frequencyWith(calibrated, ref, valueSi);
      if (hz === null) continue;
      // A divider so lopsided that no stage could start it is no suggestion (the same bound the design check uses).
      const beta = tankModel(design.topology, { ...nominalValues(design), [ref]: valueSi }, 0, design.windings).feedbackFraction;
      if (beta !== null && Number.isFinite(beta) && limitProblem("feedbackFraction", beta, "β") !== null) continue;
      const error = Math.abs(hz - targetHz);
      const step = Math.abs(Math.log(valueSi / current));
      // Ties go to the smaller change, so the current value wins when nothing beats it.
      if (best === null || error < best.error * (1 - 1e-12) || (Math.abs(error - best.error) <= 1e-12 * best.error && step < best.step)) {
        best = { ref, valueSi, hz, error, step };
      }
    }
  }
  if (best === null) throw new RangeError("no standard value gives a realisable tank (the calibration leaves no capacitance)");

  // f0 falls as any L or C rises, so each part's reachable span runs between its two extreme values.
  let reachMin = Number.POSITIVE_INFINITY;
  let reachMax = Number.NEGATIVE_INFINITY;
  for (const ref of refs) {
    const kind = TOPOLOGY_PARTS[design.topology][ref].kind === "capacitance" ? "capacitance" : "inductance";
    const { lowSi, highSi } = valueRange(kind, design.parts[ref].valueSi);
    for (const valueSi of [lowSi, highSi, design.parts[ref].valueSi]) {
      const hz = frequencyWith(calibrated, ref, valueSi);
      if (hz === null) continue;
      reachMin = Math.min(reachMin, hz);
      reachMax = Math.max(reachMax, hz);
    }
  }
  const reachable = targetHz >= reachMin * (1 - 1e-12) && targetHz <= reachMax * (1 + 1e-12);
  const nearestReachableHz = reachable ? null : targetHz < reachMin ? reachMin : reachMax;
  const unreachableReason = reachable
    ? null
    : `the ${formatEngineering(targetHz, "Hz", 6, { trimZeros: true })} target cannot be reached by changing ${refs.length === 1 ? "" : "any one of "}` +
      `${listWords(refs)} within ${SEARCH_DECADES} decades of ${refs.length === 1 ? "its" : "their"} present value and the bench limits; ` +
      `the nearest reachable frequency is ${formatEngineering(nearestReachableHz as number, "Hz", 6)}` +
      (design.topology === "clapp" && refs.includes("C3") && targetHz < reachMin
        ? " (a Clapp's C3 cannot take f0 below the Colpitts frequency of C1 and C2 in series)"
        : "");

  const role = TOPOLOGY_PARTS[design.topology][best.ref];
  const fromSi = design.parts[best.ref].valueSi;
  const retuned: OscillatorDesign = {
    ...calibrated,
    parts: { ...calibrated.parts, [best.ref]: { ...calibrated.parts[best.ref], valueSi: best.valueSi } },
  };
  const worst = worstCaseBand(retuned);
  const stat = statisticalBand(retuned, options.statistical);
  const unit = role.kind === "capacitance" ? "F" : "H";
  const after = tankModel(retuned.topology, nominalValues(retuned), parallelCapacitanceF(retuned), retuned.windings);
  const before = tankModel(calibrated.topology, nominalValues(calibrated), parallelCapacitanceF(calibrated), calibrated.windings);
  const currentHz = frequencyWith(calibrated, best.ref, fromSi) as number;
  const onTarget = options.targetToleranceHz !== undefined && Math.abs(currentHz - targetHz) <= options.targetToleranceHz;
  const startupWarning =
    before.minGain !== null && after.minGain !== null && before.feedbackFraction !== null && after.feedbackFraction !== null
      ? startupWarningText(best.ref, unit, fromSi, best.valueSi, { beta: before.feedbackFraction, gain: before.minGain }, { beta: after.feedbackFraction, gain: after.minGain })
      : null;
  return {
    part: best.ref,
    unit,
    fromSi,
    toSi: best.valueSi,
    fromF: unit === "F" ? fromSi : null,
    toF: unit === "F" ? best.valueSi : null,
    fromH: unit === "H" ? fromSi : null,
    toH: unit === "H" ? best.valueSi : null,
    idealSi: solvePartValue(calibrated, best.ref, targetHz),
    changed: best.valueSi !== fromSi,
    targetHz,
    predictedHz: best.hz,
    errorHz: best.hz - targetHz,
    errorPercent: ((best.hz - targetHz) / targetHz) * 100,
    feedbackFraction: after.feedbackFraction,
    minGain: after.minGain,
    feedbackFractionBefore: before.feedbackFraction,
    minGainBefore: before.minGain,
    startupWarning,
    currentHz,
    onTarget,
    reachable,
    nearestReachableHz,
    reachableBand: { minHz: reachMin, maxHz: reachMax },
    unreachableReason,
    series,
    calibrationCapacitanceF,
    worstCase: { minHz: worst.minHz, maxHz: worst.maxHz },
    statistical: { minHz: stat.minHz, maxHz: stat.maxHz },
    design: retuned,
  };
}
