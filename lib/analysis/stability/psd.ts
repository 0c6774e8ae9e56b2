import { nextPowerOfTwo, realFft } from "../fft";

/** A one-sided power spectral density of a uniformly sampled series. */
export interface OneSidedPsd {
  /** Bin spacing, Hz (the series is zero-padded to a power of two). */
  binHz: number;
  /** S(f) at k·binHz for k = 0..fftLength/2, units² per Hz. */
  density: Float64Array;
  /** Length of the series before padding, and its duration (s). */
  points: number;
  durationS: number;
}

/** Hann's equivalent noise bandwidth in bins (Harris 1978, Table 1): a band of B Hz holds about B·T/1.5 independent values. */
export const HANN_ENBW_BINS = 1.5;

/**
 * Removes the mean and the least-squares line: what remains of a phase series once the fitted
 * frequency and phase are taken out (the fit absorbs what lies below 1/T).
 */
export function detrend(x: Float64Array): Float64Array {
  const n = x.length;
  const out = new Float64Array(n);
  if (n === 0) return out;
  const centre = (n - 1) / 2;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i];
  mean /= n;
  let num = 0;
  let den = 0;
  for (let i = 0; i < n; i++) {
    const m = i - centre;
    num += m * (x[i] - mean);
    den += m * m;
  }
  const slope = den > 0 ? num / den : 0;
  for (let i = 0; i < n; i++) out[i] = x[i] - mean - slope * (i - centre);
  return out;
}

/**
 * One-sided PSD by a Hann-windowed periodogram, S(f_k) = 2|X_k|² / (fs·Σw²), normalised so that
 * Σ S·Δf over the one-sided bins equals the mean square of the windowed series' power (Heinzel,
 * Rüdiger & Schilling 2002, §9, power spectral density with window correction).
 *
 * @param x - the series (already detrended), any length ≥ 2
 * @param sampleRateHz - its sampling rate, Hz
 */
export function hannPsd(x: Float64Array, sampleRateHz: number): OneSidedPsd {
  const n = x.length;
  const size = nextPowerOfTwo(Math.max(4, n));
  const buffer = new Float64Array(size);
  let sumW2 = 0;
  for (let i = 0; i < n; i++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / n);
    buffer[i] = x[i] * w;
    sumW2 += w * w;
  }
  const spectrum = realFft(buffer);
  const half = size / 2;
  const density = new Float64Array(half + 1);
  const scale = 2 / (sampleRateHz * sumW2);
  for (let k = 0; k <= half; k++) {
    const re = spectrum[2 * k];
    const im = spectrum[2 * k + 1];
    // DC and Nyquist are not doubled in a one-sided density.
    density[k] = (re * re + im * im) * (k === 0 || k === half ? scale / 2 : scale);
  }
  return { binHz: sampleRateHz / size, density, points: n, durationS: n / sampleRateHz };
}

/** Mean density over the bins whose frequency lies in [lowHz, highHz], with how many bins and approximate dof. */
export function bandMean(psd: OneSidedPsd, lowHz: number, highHz: number): { mean: number; bins: number; dof: number } | undefined {
  const first = Math.max(1, Math.ceil(lowHz / psd.binHz - 1e-9));
  const last = Math.min(psd.density.length - 1, Math.floor(highHz / psd.binHz + 1e-9));
  if (last < first) return undefined;
  let sum = 0;
  for (let k = first; k <= last; k++) sum += psd.density[k];
  const bins = last - first + 1;
  // Zero padding interpolates; independent values come at 1/T, and Hann widens each to 1.5 of them.
  const independent = Math.max(1, (bins * psd.binHz * psd.durationS) / HANN_ENBW_BINS);
  return { mean: sum / bins, bins, dof: 2 * independent };
}

/**
 * ∫ S(f) df over [lowHz, highHz] as the bin sum Σ S_k·Δf, with a Satterthwaite estimate of its
 * degrees of freedom ((Σ S)² / Σ S², scaled to independent bins): a red spectrum's integral rests
 * on its few lowest bins and is known to fewer dof than the bin count suggests.
 */
export function bandIntegral(psd: OneSidedPsd, lowHz: number, highHz: number): { integral: number; bins: number; dof: number } {
  const first = Math.max(1, Math.ceil(lowHz / psd.binHz - 1e-9));
  const last = Math.min(psd.density.length - 1, Math.floor(highHz / psd.binHz + 1e-9));
  let sum = 0;
  let sumSquares = 0;
  for (let k = first; k <= last; k++) {
    sum += psd.density[k];
    sumSquares += psd.density[k] * psd.density[k];
  }
  const bins = Math.max(0, last - first + 1);
  const effectiveBins = sumSquares > 0 ? (sum * sum) / sumSquares : 0;
  const independent = Math.max(1, (effectiveBins * psd.binHz * psd.durationS) / HANN_ENBW_BINS);
  return { integral: sum * psd.binHz, bins, dof: 2 * independent };
}

/**
 * A spur-proof white level over [lowHz, highHz]: the median bin over ln 2. Each periodogram bin of a
 * Gaussian series is exponential (χ² with 2 dof) whatever its neighbours, so its median is ln 2 of its
 * mean; a few bins lifted by a spur or a sideband move the median hardly at all, the mean a lot.
 */
export function bandWhiteLevel(psd: OneSidedPsd, lowHz: number, highHz: number): { mean: number; bins: number; dof: number } | undefined {
  const first = Math.max(1, Math.ceil(lowHz / psd.binHz - 1e-9));
  const last = Math.min(psd.density.length - 1, Math.floor(highHz / psd.binHz + 1e-9));
  if (last < first) return undefined;
  const values = Float64Array.from(psd.density.subarray(first, last + 1)).sort();
  const n = values.length;
  const median = n % 2 ? values[(n - 1) / 2] : (values[n / 2 - 1] + values[n / 2]) / 2;
  const band = bandMean(psd, lowHz, highHz)!;
  // A median is a little less efficient than a mean (2/π for a normal; taken as such here).
  return { mean: median / Math.LN2, bins: n, dof: band.dof * (2 / Math.PI) };
}
