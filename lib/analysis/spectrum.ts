import { addRealPower, fftPlan, nextPowerOfTwo } from "./fft";
import { WINDOW_COEFFICIENTS, type WindowName } from "./windows";

/** A one-sided, windowed amplitude spectrum. */
export interface Spectrum {
  /** FFT length (a power of two; the record is zero-padded up to it). */
  fftLength: number;
  /** Samples that went into each FFT (before padding). */
  segmentLength: number;
  /** Number of averaged segments (1 unless the record was longer than the FFT limit). */
  segments: number;
  sampleRateHz: number;
  /** Spacing of the bins, fs / fftLength. */
  binHz: number;
  /**
   * Peak amplitude per bin in volts, 2|X[k]|/Σw (k = 0..fftLength/2): a tone centred on a bin
   * reads its own amplitude; between bins it reads up to the window's scallop loss low.
   */
  amplitudeVpk: Float64Array;
  window: WindowName;
  /** Main-lobe half-width of the window in bins of an unpadded FFT (4 for Blackman–Harris). */
  lobeHalfWidthBins: number;
  /**
   * The median bin of amplitudeVpk (the element a sort would put at index ⌊n/2⌋): the noise floor
   * the spur search measures peaks against. Found with the spectrum, so a thread that computes the
   * spectrum for another (the `analyze` command's worker) spares that one the pass.
   */
  medianAmplitudeVpk: number;
}

/** Options for {@link windowedSpectrum}. */
export interface SpectrumOptions {
  /** Longest FFT to run; longer records are split into 50 %-overlapping segments and averaged. */
  maxFftLength?: number;
}

// 2^22 points keep the FFT's buffers near 110 MB (window buffer, half-length transform, power, table);
// a 10-million-sample record is averaged over 4 segments.
const DEFAULT_MAX_FFT_LENGTH = 1 << 22;

/**
 * buffer[i] = (x[start + i] − mean)·w[i] for a cosine-sum window of up to four terms (the engine's
 * is Blackman–Harris), computing w on the way: one rotation gives cos θ, the Chebyshev recurrence
 * cos kθ = 2cos θ·cos (k−1)θ − cos (k−2)θ gives cos 2θ and cos 3θ, and the rotation restarts from
 * exact values every block so round-off cannot build up. The terms are written out, not looped
 * over: a loop per sample cost four times the arithmetic it did.
 * @throws RangeError for a window of more than four terms
 */
function fillWindowed(
  x: Float64Array,
  start: number,
  length: number,
  mean: number,
  coefficients: readonly number[],
  buffer: Float64Array,
): void {
  if (coefficients.length > 4) throw new RangeError(`windows of up to 4 cosine terms, got ${coefficients.length}`);
  // w = a0 − a1·cos θ + a2·cos 2θ − a3·cos 3θ; absent terms are 0.
  const [a0 = 0, a1 = 0, a2 = 0, a3 = 0] = coefficients.map((value, k) => (k % 2 === 1 ? -value : value));
  const step = (2 * Math.PI) / length;
  const rc = Math.cos(step);
  const rs = Math.sin(step);
  const block = 4096;
  for (let first = 0; first < length; first += block) {
    const end = Math.min(length, first + block);
    let c = Math.cos(step * first);
    let s = Math.sin(step * first);
    for (let i = first; i < end; i++) {
      const c2 = 2 * c * c - 1;
      const c3 = 2 * c * c2 - c;
      buffer[i] = (x[start + i] - mean) * (a0 + a1 * c + a2 * c2 + a3 * c3);
      const nextCos = c * rc - s * rs;
      s = s * rc + c * rs;
      c = nextCos;
    }
  }
  buffer.fill(0, length);
}

/**
 * The element a sort would put at the middle (index ⌊n/2⌋), found by selection on a copy rather
 * than by sorting it: linear time, where sorting 2 million bins took a quarter of a second.
 * @param scratch - room for the copy when it holds at least n values (overwritten), so a caller
 *   with a buffer it no longer needs spares a new one
 */
function median(values: Float64Array, scratch?: Float64Array): number {
  const n = values.length;
  if (n === 0) return 0;
  const a = scratch && scratch.length >= n ? scratch.subarray(0, n) : new Float64Array(n);
  a.set(values);
  const k = n >> 1;
  let lo = 0;
  let hi = n - 1;
  // Hoare's selection with a median-of-three pivot: after each partition the k-th smallest lies
  // in the part that holds index k.
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    let x = a[lo];
    let y = a[mid];
    let z = a[hi];
    if (x > y) [x, y] = [y, x];
    if (y > z) y = z;
    const pivot = x > y ? x : y;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return a[k];
}

/**
 * Windowed amplitude spectrum of a record, with its mean removed first so the DC term cannot
 * bury a low-frequency tone. The 4-term Blackman–Harris window (−92 dB sidelobes, Harris 1978)
 * keeps leakage of a full-scale fundamental below the harmonics and spurs worth reporting.
 *
 * @param samples - the record in volts
 * @param sampleRateHz - sample rate in Hz
 * @param options - see {@link SpectrumOptions}
 * @returns the spectrum, zero-padded to a power of two; averaged power over segments for records
 *   longer than the FFT limit
 */
export function windowedSpectrum(
  samples: Float64Array,
  sampleRateHz: number,
  options: SpectrumOptions = {},
): Spectrum {
  const maxFftLength = options.maxFftLength ?? DEFAULT_MAX_FFT_LENGTH;
  const n = samples.length;
  const segmentLength = n <= maxFftLength ? n : maxFftLength;
  const fftLength = nextPowerOfTwo(segmentLength);
  const hop = Math.max(1, Math.floor(segmentLength / 2));
  const starts: number[] = [];
  if (segmentLength === n) starts.push(0);
  else {
    for (let s = 0; s + segmentLength <= n; s += hop) starts.push(s);
    // Cover the tail too, so no part of the record is left out of the average.
    if (starts[starts.length - 1] + segmentLength < n) starts.push(n - segmentLength);
  }
  const window: WindowName = "blackman-harris-4";
  const coefficients = WINDOW_COEFFICIENTS[window];
  // Σw of a periodic cosine-sum window is exactly N·a0 (the cosines sum to zero over whole periods).
  const sum = segmentLength * coefficients[0];
  let mean = 0;
  for (let i = 0; i < n; i++) mean += samples[i];
  mean /= n;

  const bins = fftLength / 2 + 1;
  const power = new Float64Array(bins);
  const buffer = new Float64Array(fftLength);
  let scratch: Float64Array | undefined;
  for (const start of starts) {
    fillWindowed(samples, start, segmentLength, mean, coefficients, buffer);
    scratch = addRealPower(buffer, power, scratch);
  }
  const amplitudeVpk = power;
  const scale = 2 / sum;
  for (let k = 0; k < bins; k++) amplitudeVpk[k] = Math.sqrt(power[k] / starts.length) * scale;
  // The one-sided doubling does not apply to DC or Nyquist.
  amplitudeVpk[0] /= 2;
  amplitudeVpk[bins - 1] /= 2;
  return {
    fftLength,
    segmentLength,
    segments: starts.length,
    sampleRateHz,
    binHz: sampleRateHz / fftLength,
    amplitudeVpk,
    window,
    lobeHalfWidthBins: 4,
    // The window buffer is done with (fftLength ≥ bins): at 2^22 points that spares 16 MB.
    medianAmplitudeVpk: median(amplitudeVpk, buffer),
  };
}

/**
 * Readies a thread for {@link windowedSpectrum} of a record of about `samples` samples, for a
 * worker with time on its hands before the record arrives: builds the plan of the half-length FFT
 * {@link addRealPower} runs for that length (a first call's largest set-up) and runs the code on
 * short records until the optimising compiler has it, so the real call does not start out
 * interpreted. Changes no result.
 *
 * @param samples - the expected record length (a wrong guess only wastes the plan)
 * @param options - as for the real call
 */
export function prepareWindowedSpectrum(samples: number, options: SpectrumOptions = {}): void {
  const segmentLength = Math.min(Math.max(2, Math.floor(samples)), options.maxFftLength ?? DEFAULT_MAX_FFT_LENGTH);
  fftPlan(Math.max(2, nextPowerOfTwo(segmentLength) / 2));
  const short = new Float64Array(1 << 12);
  for (let i = 0; i < short.length; i++) short[i] = Math.cos(0.3 * i);
  for (let round = 0; round < 8; round++) windowedSpectrum(short, 1);
}

/**
 * Coarse frequency of the strongest tone: the highest bin above the DC lobe, refined by a parabola
 * through the log magnitudes of it and its neighbours (good to a few hundredths of a bin with
 * Blackman–Harris, which is all the sine fit needs as a start).
 *
 * @param spectrum - from {@link windowedSpectrum}
 * @returns frequency in Hz, or undefined when the spectrum has no bin above the DC lobe
 */
export function coarsePeakHz(spectrum: Spectrum): number | undefined {
  const a = spectrum.amplitudeVpk;
  const padding = spectrum.fftLength / spectrum.segmentLength;
  const first = Math.ceil(spectrum.lobeHalfWidthBins * padding) + 1;
  let best = -1;
  let bestValue = -Infinity;
  for (let k = first; k < a.length - 1; k++) {
    if (a[k] > bestValue) {
      bestValue = a[k];
      best = k;
    }
  }
  if (best < 0 || !(bestValue > 0)) return undefined;
  const left = Math.log(Math.max(a[best - 1], 1e-300));
  const centre = Math.log(a[best]);
  const right = Math.log(Math.max(a[best + 1], 1e-300));
  const denominator = left - 2 * centre + right;
  const delta = denominator < 0 ? (0.5 * (left - right)) / denominator : 0;
  return (best + Math.max(-0.5, Math.min(0.5, delta))) * spectrum.binHz;
}
