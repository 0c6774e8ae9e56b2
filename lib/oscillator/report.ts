/**
 * Everything the predict command, the upload snapshot and the API report about one design, in one plain object.
 */

import type { OscillatorDesign } from "./design";
import { analyseDrift, type DriftAnalysis } from "./drift";
import type { ESeriesName } from "./e-series";
import { suggestRetune, type RetuneSuggestion } from "./retune";
import { invalidCornersText, rssBand, statisticalBand, worstCaseBand, type RssBand, type StatisticalBand, type StatisticalOptions, type WorstCaseBand } from "./tolerance";
import { predictOscillator, type OscillatorPrediction } from "./topologies";

export interface ReportOptions {
  measuredHz?: number;
  targetHz?: number;
  series?: ESeriesName;
  part?: string;
  includeInductors?: boolean;
  statistical?: StatisticalOptions;
}

export interface DesignReport {
  topology: OscillatorDesign["topology"];
  predictedHz: number;
  cEffF: number;
  lEffH: number;
  mutualInductanceH: number | null;
  extraCapacitanceF: number;
  feedbackFraction: number | null;
  minGain: number | null;
  assumptions: string;
  worstCase: Pick<WorstCaseBand, "minHz" | "maxHz" | "corners" | "invalidCorners" | "invalidReason">;
  statistical: StatisticalBand;
  rss: RssBand;
  drift?: Omit<DriftAnalysis, "predictedHz">;
  retune?: Omit<RetuneSuggestion, "design">;
  /**
   * Set when some tolerance corners make the model invalid (the nominal prediction above still holds): what
   * happened and what it means for the bands. Null otherwise.
   */
  bandWarning: string | null;
}

/**
 * Prediction, tolerance bands, and optionally drift and a retune suggestion for one design.
 *
 * @param design - validated first.
 * @param options - measured and target frequency (Hz), series and part for the retune, Monte Carlo options.
 * @returns a JSON-serialisable report; see the predict command for the field contract.
 * @throws RangeError when the design or an option is invalid.
 */
export function buildDesignReport(design: OscillatorDesign, options: ReportOptions = {}): DesignReport {
  const prediction: OscillatorPrediction = predictOscillator(design);
  const worst = worstCaseBand(design);
  const report: DesignReport = {
    topology: prediction.topology,
    predictedHz: prediction.predictedHz,
    cEffF: prediction.cEffF,
    lEffH: prediction.lEffH,
    mutualInductanceH: prediction.mutualInductanceH,
    extraCapacitanceF: prediction.extraCapacitanceF,
    feedbackFraction: prediction.feedbackFraction,
    minGain: prediction.minGain,
    assumptions: prediction.assumptions,
    worstCase: { minHz: worst.minHz, maxHz: worst.maxHz, corners: worst.corners, invalidCorners: worst.invalidCorners, invalidReason: worst.invalidReason },
    statistical: statisticalBand(design, options.statistical),
    rss: rssBand(design),
    bandWarning: invalidCornersText(worst),
  };
  if (options.measuredHz !== undefined) {
    const { predictedHz: _predicted, ...drift } = analyseDrift(design, options.measuredHz);
    report.drift = drift;
  }
  if (options.targetHz !== undefined) {
    const { design: _retuned, ...retune } = suggestRetune(design, {
      targetHz: options.targetHz,
      measuredHz: options.measuredHz,
      series: options.series,
      part: options.part,
      includeInductors: options.includeInductors,
      statistical: options.statistical,
    });
    report.retune = retune;
  }
  return report;
}
