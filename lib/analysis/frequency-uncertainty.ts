import { fitFrequencySigmaHz, fitSine4 } from "./sine-fit";

/** The frequency's standard uncertainty and where it comes from. */
export interface FrequencyUncertainty {
  /** From the fit residual, for white additive noise (the Cramér–Rao-bound model). */
  whiteNoiseHz: number;
  /**
   * What the oscillator's own frequency noise adds, from the scatter of segment frequencies beyond
   * what their white-noise uncertainties explain; 0 when the scatter is explained, null when the
   * record is too short to split.
   */
  frequencyNoiseHz: number | null;
  /** √(white² + frequency noise²): the statistical 1σ of the capture's frequency. */
  statisticalHz: number;
  /** Segments compared, 0 when not assessed. */
  segments: number;
  /** Σ((f_k − f̄)/σ_k)² / (K − 1): about 1 when white noise explains the scatter; null when not assessed. */
  scatterRatio: number | null;
}

const MAX_SEGMENTS = 8;
const MIN_SEGMENTS = 4;
const MIN_PERIODS_PER_SEGMENT = 8;
const MIN_SAMPLES_PER_SEGMENT = 64;
/** χ² 99th percentiles for 3..7 degrees of freedom (any statistics table, e.g. NIST/SEMATECH e-Handbook §1.3.6.7.4). */
const CHI_SQUARE_99: Record<number, number> = { 3: 11.345, 4: 13.277, 5: 15.086, 6: 16.812, 7: 18.475 };

/**
 * The whole record's frequency uncertainty under white additive noise and under the oscillator's
 * own frequency noise. A least-squares frequency over a record of length T averages the
 * instantaneous frequency with a parabolic weight; under white FM its variance is 1.2·q/T, and
 * that of each of K segments 1.2·q·K/T, so the excess variance of the segment frequencies over
 * their white-noise share, divided by K, is what the whole record carries. The excess is only
 * counted when the scatter fails a χ² test at 99 % (white noise alone would rarely produce it).
 *
 * Limits: frequency noise too small to show in segments of 1/K of the record (below about K times
 * the white-noise σ of the whole record) goes unseen; drift within the record is reported apart.
 *
 * @param y - the record with its distortion removed, volts
 * @param sampleRateHz - sample rate in Hz
 * @param frequencyHz - the whole record's fitted frequency
 * @param whiteNoiseHz - the whole record's white-noise 1σ
 */
export function frequencyUncertainty(y: Float64Array, sampleRateHz: number, frequencyHz: number, whiteNoiseHz: number): FrequencyUncertainty {
  const n = y.length;
  const cycles = (frequencyHz * n) / sampleRateHz;
  const segments = Math.min(MAX_SEGMENTS, Math.floor(cycles / MIN_PERIODS_PER_SEGMENT), Math.floor(n / MIN_SAMPLES_PER_SEGMENT));
  const notAssessed = { whiteNoiseHz, frequencyNoiseHz: null, statisticalHz: whiteNoiseHz, segments: 0, scatterRatio: null };
  if (segments < MIN_SEGMENTS) return notAssessed;
  const length = Math.floor(n / segments);
  const fits = Array.from({ length: segments }, (_, k) =>
    fitSine4(y, sampleRateHz, frequencyHz, { start: k * length, length, maxIterations: 3 }),
  );
  const sigmas = fits.map((f) => fitFrequencySigmaHz(f, sampleRateHz));
  if (sigmas.some((s) => !(s > 0))) return { ...notAssessed, segments, frequencyNoiseHz: 0 };
  let weightSum = 0;
  let weighted = 0;
  for (let k = 0; k < segments; k++) {
    const w = 1 / sigmas[k] ** 2;
    weightSum += w;
    weighted += w * fits[k].frequencyHz;
  }
  const mean = weighted / weightSum;
  let chiSquare = 0;
  let squares = 0;
  let whiteShare = 0;
  for (let k = 0; k < segments; k++) {
    const d = fits[k].frequencyHz - mean;
    chiSquare += (d / sigmas[k]) ** 2;
    squares += d * d;
    whiteShare += sigmas[k] ** 2;
  }
  const dof = segments - 1;
  const scatterRatio = chiSquare / dof;
  let frequencyNoiseHz = 0;
  if (chiSquare > CHI_SQUARE_99[dof]) {
    const excess = Math.max(0, squares / dof - whiteShare / segments);
    frequencyNoiseHz = Math.sqrt(excess / segments);
  }
  return {
    whiteNoiseHz,
    frequencyNoiseHz,
    statisticalHz: Math.hypot(whiteNoiseHz, frequencyNoiseHz),
    segments,
    scatterRatio,
  };
}
