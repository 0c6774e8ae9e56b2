/**
 * A design's prediction as it will likely measure on one construction in this lab: the lab's figure for that
 * construction and topology taken as one more capacitance in parallel with C_eff (no new physics, the same model
 * lib/oscillator uses for a declared extra capacitance), and the bands widened by how much builds disagree.
 * Pure: no I/O.
 */
import {
  buildDesignReport,
  predictOscillator,
  worstCaseBand,
  type OscillatorDesign,
  type StatisticalOptions,
} from "@/lib/oscillator";

/** The lab's figure as the prediction uses it. */
export interface LabCapacitance {
  /** Median implied extra capacitance across steady builds, F (signed). */
  medianF: number;
  /** Spread between builds as a standard deviation (scaled MAD), F; null or 0 when unknown (one build). */
  spreadF: number | null;
}

export interface FrequencyBandHz {
  minHz: number;
  maxHz: number;
}

export interface PredictionFigures {
  predictedHz: number;
  /** C_eff the inductance sees, every parallel capacitance included, F. */
  cEffF: number;
  lEffH: number;
  /** Every part at its tolerance corner. */
  worstCase: FrequencyBandHz;
  /** Central 99.7 % of simulated builds (Monte Carlo over the part tolerances). */
  statistical: FrequencyBandHz;
}

export interface CalibratedPrediction {
  asDesigned: PredictionFigures;
  /** With the lab's figure added in parallel; bands widened by its spread. */
  asBuilt: PredictionFigures;
  labCapacitanceF: number;
  labSpreadF: number;
  /** asBuilt − asDesigned, Hz. */
  shiftHz: number;
}

/** Sigmas of the lab's spread that the worst case takes (the 99.7 % share of a normal spread, as the statistical band). */
export const LAB_SPREAD_SIGMAS = 3;

/**
 * Both predictions of a design: as designed, and with the lab's figure for a construction added.
 *
 * The worst case spans the design's corner bands at the lab figure ± {@link LAB_SPREAD_SIGMAS} spreads (the corners
 * and the construction both at their extremes). The statistical band adds the lab's spread in quadrature with the
 * tolerance spread: a half-width h becomes √(h² + (3·σ_f)²), where σ_f = f·σ_C/(2·C_eff) is the frequency spread
 * the capacitance spread gives (df/dC = −f/(2C) from f0 = 1/(2π√(L·C)), common practice).
 *
 * @param design - the design as entered (its own declared extra capacitance stays in).
 * @param lab - the lab's median and spread, F.
 * @param options - Monte Carlo options for the statistical band.
 * @throws RangeError when the design is invalid, the lab figure is not finite, or it leaves no capacitance in the tank.
 */
export function calibratedPrediction(design: OscillatorDesign, lab: LabCapacitance, options: StatisticalOptions = {}): CalibratedPrediction {
  if (!Number.isFinite(lab.medianF)) throw new RangeError(`the lab's capacitance must be a finite number of F; got ${lab.medianF}`);
  const spreadF = lab.spreadF ?? 0;
  if (!(Number.isFinite(spreadF) && spreadF >= 0)) throw new RangeError(`the lab's spread must be a finite number of F, 0 or above; got ${lab.spreadF}`);

  const designed = buildDesignReport(design, { statistical: options });
  const asDesigned: PredictionFigures = {
    predictedHz: designed.predictedHz,
    cEffF: designed.cEffF,
    lEffH: designed.lEffH,
    worstCase: { minHz: designed.worstCase.minHz, maxHz: designed.worstCase.maxHz },
    statistical: { minHz: designed.statistical.minHz, maxHz: designed.statistical.maxHz },
  };

  const withLab = (extraF: number): OscillatorDesign => ({ ...design, calibrationCapacitanceF: (design.calibrationCapacitanceF ?? 0) + extraF });
  const calibrated = withLab(lab.medianF);
  if (designed.cEffF + lab.medianF - LAB_SPREAD_SIGMAS * spreadF <= 0) {
    throw new RangeError(
      `the lab's figure (${lab.medianF} F, spread ${spreadF} F) would leave no capacitance in a tank of ${designed.cEffF} F; the figure does not fit this design`,
    );
  }
  const report = buildDesignReport(calibrated, { statistical: options });

  // More capacitance lowers f0: the low corner comes with the most the construction adds, the high with the least.
  const low = worstCaseBand(withLab(lab.medianF + LAB_SPREAD_SIGMAS * spreadF)).minHz;
  const high = worstCaseBand(withLab(lab.medianF - LAB_SPREAD_SIGMAS * spreadF)).maxHz;

  const f = report.predictedHz;
  const sigmaHz = (f * spreadF) / (2 * report.cEffF);
  const widen = (halfWidthHz: number) => Math.sqrt(halfWidthHz ** 2 + (LAB_SPREAD_SIGMAS * sigmaHz) ** 2);
  const asBuilt: PredictionFigures = {
    predictedHz: f,
    cEffF: report.cEffF,
    lEffH: report.lEffH,
    worstCase: { minHz: low, maxHz: high },
    statistical: { minHz: f - widen(f - report.statistical.minHz), maxHz: f + widen(report.statistical.maxHz - f) },
  };
  return { asDesigned, asBuilt, labCapacitanceF: lab.medianF, labSpreadF: spreadF, shiftHz: f - designed.predictedHz };
}

/** f0 of the calibrated nominal design alone, Hz (no bands; cheap enough for a chart of many designs). */
export function calibratedFrequencyHz(design: OscillatorDesign, labCapacitanceF: number): number {
  return predictOscillator({ ...design, calibrationCapacitanceF: (design.calibrationCapacitanceF ?? 0) + labCapacitanceF }).predictedHz;
}
