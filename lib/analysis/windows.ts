/**
 * Cosine-sum windows in their periodic ("DFT-even") form, w[n] = Σ_k (−1)^k a_k cos(2πkn/N),
 * n = 0..N−1 (Harris 1978 §IV; Heinzel, Rüdiger & Schilling 2002, App. C/D).
 */

/** Windows the engine knows by name. */
export type WindowName =
  | "rectangular"
  | "hann"
  | "hamming"
  | "blackman"
  | "blackman-harris-4"
  | "nuttall-4c"
  | "hft95";

/** Coefficients a_k of each window (Harris 1978 Table 1; Heinzel et al. 2002 App. D for HFT95). */
export const WINDOW_COEFFICIENTS: Readonly<Record<WindowName, readonly number[]>> = {
  rectangular: [1],
  hann: [0.5, 0.5],
  hamming: [0.54, 0.46],
  blackman: [0.42, 0.5, 0.08],
  "blackman-harris-4": [0.35875, 0.48829, 0.14128, 0.01168],
  "nuttall-4c": [0.3635819, 0.4891775, 0.1365995, 0.0106411],
  hft95: [1, 1.9383379, 1.3045202, 0.402827, 0.0350665],
};

/**
 * Samples a cosine-sum window.
 *
 * @param name - the window
 * @param length - number of samples N (≥ 1)
 * @returns w[0..N−1], periodic form (w[0] is the minimum, the peak sits at N/2)
 * @throws RangeError when length is not a positive integer
 */
export function windowSamples(name: WindowName, length: number): Float64Array {
  if (!Number.isInteger(length) || length < 1) {
    throw new RangeError(`window length must be a positive integer, got ${length}`);
  }
  const coefficients = WINDOW_COEFFICIENTS[name];
  const w = new Float64Array(length);
  const step = (2 * Math.PI) / length;
  for (let n = 0; n < length; n++) {
    let value = coefficients[0];
    for (let k = 1; k < coefficients.length; k++) {
      value += (k % 2 === 1 ? -1 : 1) * coefficients[k] * Math.cos(step * k * n);
    }
    w[n] = value;
  }
  return w;
}

/** Figures of merit of a window (Harris 1978 §III; Heinzel et al. 2002 §10–11). */
export interface WindowFactors {
  /** Coherent gain Σw / (N·max w): a bin-centred tone reads CG·A·N/2. */
  coherentGain: number;
  /** Normalized equivalent noise bandwidth N·Σw² / (Σw)², in bins. */
  nenbwBins: number;
  /** Σw, for amplitude calibration (A = 2|X| / Σw). */
  sum: number;
  /** Σw², for power calibration. */
  sumOfSquares: number;
}

/**
 * Computes coherent gain and equivalent noise bandwidth of a sampled window.
 * @param w - window samples
 * @returns the factors; NENBW in Hz is nenbwBins·fs/N
 */
export function windowFactors(w: Float64Array): WindowFactors {
  let sum = 0;
  let sumOfSquares = 0;
  let max = -Infinity;
  for (let n = 0; n < w.length; n++) {
    sum += w[n];
    sumOfSquares += w[n] * w[n];
    if (w[n] > max) max = w[n];
  }
  return {
    coherentGain: sum / (w.length * max),
    nenbwBins: (w.length * sumOfSquares) / (sum * sum),
    sum,
    sumOfSquares,
  };
}
