import { foldedRadPerSample, type HarmonicFit } from "./harmonic-fit";
import { amplitudeRatioToDb } from "./metrics";

/**
 * How a harmonic came out: measured above its detection limit, under it (only the limit is known),
 * or not separable (its fold lands on DC, Nyquist, the fundamental or another order).
 */
export type HarmonicStatus = "measured" | "below-detection" | "not-separable";

/** One harmonic of the fundamental. */
export interface Harmonic {
  /** 2, 3, … */
  order: number;
  /** order × fundamental, Hz. */
  frequencyHz: number;
  /** Where the record shows it: |order·f − k·fs| folded into [0, fs/2], Hz. */
  seenAtHz: number;
  /** True when order·f is above half the sample rate, so the level was fitted at its folded frequency. */
  folded: boolean;
  status: HarmonicStatus;
  /** Fitted peak amplitude; null unless measured. */
  amplitudeVpk: number | null;
  /** Level relative to the fundamental, dB; null unless measured. */
  dBc: number | null;
  /** Smallest level this record could have told from its noise, dBc; null when not separable. */
  detectionLimitDbc: number | null;
  /** Why the order has no level, in a sentence; null when measured. */
  note: string | null;
}

/** THD and how far it can be trusted. */
export interface ThdReport {
  /** "measured": over the detected orders; "below-floor": no order above its detection limit; "not-measurable": an order could not be separated. */
  status: "measured" | "below-floor" | "not-measurable";
  /** √Σ of detected orders over the fundamental, as a ratio; null unless measured. */
  ratio: number | null;
  /**
   * √Σ of the undetected orders' detection limits, as a ratio: what they could add at most. THD
   * with this added in quadrature is the upper bound the record supports.
   */
  floorRatio: number;
  /** Orders that went into the figure. */
  detectedOrders: number[];
  note: string | null;
}

/**
 * An amplitude found by a least-squares fit of pure noise has a Rayleigh distribution with scale
 * s = σ·√(variance factor); P(A > k·s) = e^{−k²/2}, so k = 4 gives 3×10⁻⁴ false detections per order.
 */
export const DETECTION_SIGMAS = 4;

/** The smallest amplitude of the order at `index` of the fit that noise of this variance lets it tell apart, volts. */
export function detectionLimitVpk(fit: HarmonicFit, index: number, noiseVariance: number): number {
  return DETECTION_SIGMAS * Math.sqrt(Math.max(0, noiseVariance * fit.coefficientVarianceFactors[index]));
}

function describeFold(collidesWith: string, otherOrder: number | undefined): string {
  switch (collidesWith) {
    case "dc":
      return "folds onto DC";
    case "nyquist":
      return "folds onto half the sample rate";
    case "fundamental":
      return "folds onto the fundamental";
    default:
      return `folds onto harmonic ${otherOrder}`;
  }
}

/**
 * Turns a harmonic fit into the harmonics a technician reads, with detection limits from the
 * residual noise, and THD over the detected orders with its noise floor.
 *
 * @param fit - multi-harmonic fit at the refined fundamental
 * @param maxOrder - the highest order asked for
 * @param sampleRateHz - sample rate in Hz
 * @param noiseVariance - residual variance per sample, V²
 */
export function reportHarmonics(
  fit: HarmonicFit,
  maxOrder: number,
  sampleRateHz: number,
  noiseVariance: number,
): { harmonics: Harmonic[]; thd: ThdReport } {
  const fundamentalVpk = fit.amplitudesVpk[0];
  const omega = fit.omegaRadPerSample;
  const frequencyHz = (omega * sampleRateHz) / (2 * Math.PI);
  const toHz = (rad: number) => (rad * sampleRateHz) / (2 * Math.PI);
  const dbc = (vpk: number) => amplitudeRatioToDb(vpk / fundamentalVpk);
  const harmonics: Harmonic[] = [];
  for (let order = 2; order <= maxOrder; order++) {
    const seenAtHz = toHz(foldedRadPerSample(order * omega));
    const folded = order * omega > Math.PI;
    const index = fit.orders.indexOf(order);
    if (index < 0) {
      const why = fit.notSeparable.find((o) => o.order === order);
      harmonics.push({
        order,
        frequencyHz: order * frequencyHz,
        seenAtHz,
        folded,
        status: "not-separable",
        amplitudeVpk: null,
        dBc: null,
        detectionLimitDbc: null,
        note: `not separable: at ${order} × the fundamental it ${describeFold(why?.collidesWith ?? "", why?.otherOrder)} at this sample rate`,
      });
      continue;
    }
    const amplitudeVpk = fit.amplitudesVpk[index];
    const limitVpk = detectionLimitVpk(fit, index, noiseVariance);
    const detected = amplitudeVpk > limitVpk;
    const limitDbc = fundamentalVpk > 0 && limitVpk > 0 ? dbc(limitVpk) : null;
    harmonics.push({
      order,
      frequencyHz: order * frequencyHz,
      seenAtHz,
      folded,
      status: detected ? "measured" : "below-detection",
      amplitudeVpk: detected ? amplitudeVpk : null,
      dBc: detected && fundamentalVpk > 0 ? finite(dbc(amplitudeVpk)) : null,
      detectionLimitDbc: limitDbc !== null ? finite(limitDbc) : null,
      note: detected ? null : `under the noise: below ${limitDbc === null ? "the detection limit" : `${limitDbc.toFixed(1)} dBc`}`,
    });
  }
  return { harmonics, thd: thdOf(harmonics, fundamentalVpk) };
}

function finite(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

function thdOf(harmonics: readonly Harmonic[], fundamentalVpk: number): ThdReport {
  const detected = harmonics.filter((h) => h.status === "measured");
  let floorSquares = 0;
  for (const h of harmonics) {
    if (h.status === "below-detection" && h.detectionLimitDbc !== null) floorSquares += 10 ** (h.detectionLimitDbc / 10);
  }
  const floorRatio = Math.sqrt(floorSquares);
  const notSeparable = harmonics.filter((h) => h.status === "not-separable").map((h) => h.order);
  const detectedOrders = detected.map((h) => h.order);
  if (notSeparable.length > 0) {
    return {
      status: "not-measurable",
      ratio: null,
      floorRatio,
      detectedOrders,
      note: `not measurable: harmonic${notSeparable.length > 1 ? "s" : ""} ${notSeparable.join(", ")} cannot be separated at this sample rate`,
    };
  }
  if (!(fundamentalVpk > 0)) {
    return { status: "not-measurable", ratio: null, floorRatio, detectedOrders, note: "not measurable: no fundamental" };
  }
  if (detected.length === 0) {
    return {
      status: "below-floor",
      ratio: null,
      floorRatio,
      detectedOrders,
      note: `no harmonic stands above the noise; THD is below its floor of ${(100 * floorRatio).toPrecision(2)} %`,
    };
  }
  let squares = 0;
  for (const h of detected) squares += ((h.amplitudeVpk as number) / fundamentalVpk) ** 2;
  return {
    status: "measured",
    ratio: Math.sqrt(squares),
    floorRatio,
    detectedOrders,
    note: floorRatio > 0 ? `over harmonics ${detectedOrders.join(", ")}; the others are under the noise (floor ${(100 * floorRatio).toPrecision(2)} %)` : null,
  };
}
