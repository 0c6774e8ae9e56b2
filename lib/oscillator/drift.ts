/**
 * Measured against predicted frequency: the drift, and the capacitance or inductance error that would explain it.
 * The implied capacitance is lumped across the whole tank (REFERENCES.md §1), C_s = 1/((2πf)²·L_eff) − C_eff: an
 * "equivalent parallel" value, signed. Negative means the tank has less capacitance or inductance than modelled,
 * which no stray capacitance can cause, and the explanation text says so.
 */

import type { OscillatorDesign, Topology } from "./design";
import { predictOscillator } from "./topologies";
import { formatEngineering } from "./units";

function checkFrequency(measuredHz: number): void {
  if (!(Number.isFinite(measuredHz) && measuredHz > 0)) {
    throw new RangeError(`measured frequency must be a finite number above 0 Hz; got ${Number.isFinite(measuredHz) ? formatEngineering(measuredHz, "Hz", 4) : measuredHz}`);
  }
}

/**
 * Capacitance in parallel with C_eff that would move f0 to the measured frequency, C_eff·[(f0/f)² − 1].
 *
 * @param lEffH - effective inductance of the model, H.
 * @param cEffF - effective capacitance of the model (extra capacitance included), F.
 * @param measuredHz - measured frequency, Hz, above 0.
 * @returns signed capacitance, F; negative when the measured frequency is above the prediction.
 * @throws RangeError when `measuredHz` is not a finite number above 0.
 */
export function impliedExtraCapacitanceF(lEffH: number, cEffF: number, measuredHz: number): number {
  checkFrequency(measuredHz);
  return 1 / ((2 * Math.PI * measuredHz) ** 2 * lEffH) - cEffF;
}

/**
 * Error in L_eff that alone would move f0 to the measured frequency, 1/((2πf)²·C_eff) − L_eff.
 *
 * @returns signed inductance, H; negative when the measured frequency is above the prediction.
 * @throws RangeError when `measuredHz` is not a finite number above 0.
 */
export function impliedInductanceErrorH(lEffH: number, cEffF: number, measuredHz: number): number {
  checkFrequency(measuredHz);
  return 1 / ((2 * Math.PI * measuredHz) ** 2 * cEffF) - lEffH;
}

export type DriftDirection = "above" | "below" | "on";

export interface DriftAnalysis {
  predictedHz: number;
  measuredHz: number;
  /** measured − predicted, Hz. */
  hz: number;
  /** Drift relative to the prediction, %. */
  percent: number;
  /** Drift relative to the prediction, ppm. */
  ppm: number;
  /** Equivalent parallel capacitance that explains the drift, F (signed). */
  impliedExtraCapacitanceF: number;
  /** Alternatively, the error in L_eff that explains it, H (signed). */
  impliedInductanceErrorH: number;
  /** The same inductance error relative to L_eff, %. */
  impliedInductanceErrorPercent: number;
  direction: DriftDirection;
  /** Plain words for the UI; the wording depends on the sign. */
  explanation: string;
}

/** Below this the measurement is reported as matching the prediction. */
const MATCH_PPM = 1;

function magnitude(value: number, unit: string): string {
  return formatEngineering(Math.abs(value), unit, 4);
}

function whereStrayLands(topology: Topology): string {
  return topology === "colpitts" || topology === "clapp"
    ? "It is an equivalent parallel value: capacitance that sits across C1 or C2 alone (a transistor or a probe) " +
        "has to be larger to cause the same shift."
    : "It is an equivalent parallel value: all the unmodelled capacitance lumped across the tank.";
}

/**
 * Compares a measured frequency with a design's prediction.
 *
 * @param design - the design as built (declared extra capacitance, such as a probe's, is part of the model, so it
 *   is not counted again in the implied value).
 * @param measuredHz - measured frequency, Hz.
 * @returns drift in Hz, % and ppm; implied extra capacitance (F) and inductance error (H); and an explanation.
 * @throws RangeError when the design is invalid or `measuredHz` is not a finite number above 0.
 */
export function analyseDrift(design: OscillatorDesign, measuredHz: number): DriftAnalysis {
  checkFrequency(measuredHz);
  const prediction = predictOscillator(design);
  const { predictedHz, lEffH, cEffF } = prediction;
  const hz = measuredHz - predictedHz;
  const fraction = hz / predictedHz;
  const capacitanceF = impliedExtraCapacitanceF(lEffH, cEffF, measuredHz);
  const inductanceH = impliedInductanceErrorH(lEffH, cEffF, measuredHz);
  const inductancePercent = (inductanceH / lEffH) * 100;
  const ppm = fraction * 1e6;
  const direction: DriftDirection = Math.abs(ppm) < MATCH_PPM ? "on" : hz > 0 ? "above" : "below";
  const drift = `${magnitude(hz, "Hz")} (${Math.abs(fraction * 100).toFixed(3)} %)`;

  let explanation: string;
  if (direction === "on") {
    explanation = `The measured frequency matches the prediction to within ${MATCH_PPM} ppm.`;
  } else if (direction === "below") {
    explanation =
      `Measured ${drift} below the prediction. An extra ${magnitude(capacitanceF, "F")} in parallel with the tank ` +
      `would explain it; layout stray, transistor and probe capacitance add in this way. Or the inductance is ` +
      `${magnitude(inductanceH, "H")} (${Math.abs(inductancePercent).toFixed(3)} %) more than modelled. ` +
      whereStrayLands(design.topology);
  } else {
    explanation =
      `Measured ${drift} above the prediction, so the tank has less capacitance or less inductance than the model. ` +
      `Either the effective tank capacitance is ${magnitude(capacitanceF, "F")} short (an equivalent parallel value of ` +
      `${formatEngineering(capacitanceF, "F", 4)}), or the inductance is ${magnitude(inductanceH, "H")} ` +
      `(${Math.abs(inductancePercent).toFixed(3)} %) less than modelled. Added capacitance only lowers the ` +
      `frequency, so look for parts below their nominal value, a wrong value fitted, a coil with fewer turns or a ` +
      `different core, or capacitance the model counts that is not there (a probe declared but not connected).`;
  }

  return {
    predictedHz,
    measuredHz,
    hz,
    percent: fraction * 100,
    ppm,
    impliedExtraCapacitanceF: capacitanceF,
    impliedInductanceErrorH: inductanceH,
    impliedInductanceErrorPercent: inductancePercent,
    direction,
    explanation,
  };
}
