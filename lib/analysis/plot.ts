import type { Spectrum } from "./spectrum";

/** The waveform reduced to one min/max pair per bucket of consecutive samples. */
export interface WaveformEnvelope {
  /** Time of each bucket's first sample, seconds. */
  timeS: number[];
  minV: number[];
  maxV: number[];
  /** Samples per bucket (1 when the record is short enough to plot whole). */
  samplesPerPoint: number;
}

/** The spectrum reduced to at most a few thousand points, keeping every peak. */
export interface SpectrumPlot {
  frequencyHz: number[];
  /** Level per point in dBV (dB re 1 V rms) of the largest bin the point stands for. */
  dBV: number[];
  /** Bins per point. */
  binsPerPoint: number;
  binHz: number;
  window: string;
}

/** A harmonic's position on the spectrum plot. */
export interface HarmonicMarker {
  order: number;
  frequencyHz: number;
  dBV: number;
}

/** Everything the pages need to draw a capture. */
export interface PlotData {
  waveform: WaveformEnvelope;
  spectrum: SpectrumPlot;
  /** Fundamental (order 1) and harmonics, levels from the least-squares fit. */
  harmonicMarkers: HarmonicMarker[];
}

/** dBV of a peak amplitude: 20·log10(Vpk/√2), floored at −400 so plots and JSON never see −∞. */
export function peakToDbv(amplitudeVpk: number): number {
  return amplitudeVpk > 0 ? Math.max(-400, 20 * Math.log10(amplitudeVpk / Math.SQRT2)) : -400;
}

/**
 * Min/max envelope of a waveform: drawing both edges of each bucket shows every excursion a
 * full-resolution plot would, at a fraction of the points.
 *
 * @param y - the record in volts
 * @param sampleRateHz - sample rate in Hz
 * @param startTimeS - time of the first sample in seconds
 * @param maxPoints - most buckets to return (≥ 1)
 * @returns the envelope
 */
export function waveformEnvelope(y: Float64Array, sampleRateHz: number, startTimeS: number, maxPoints = 2000): WaveformEnvelope {
  const perPoint = Math.max(1, Math.ceil(y.length / Math.max(1, Math.floor(maxPoints))));
  const timeS: number[] = [];
  const minV: number[] = [];
  const maxV: number[] = [];
  for (let first = 0; first < y.length; first += perPoint) {
    const last = Math.min(y.length, first + perPoint);
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = first; i < last; i++) {
      if (y[i] < lo) lo = y[i];
      if (y[i] > hi) hi = y[i];
    }
    timeS.push(startTimeS + first / sampleRateHz);
    minV.push(lo);
    maxV.push(hi);
  }
  return { timeS, minV, maxV, samplesPerPoint: perPoint };
}

/**
 * Reduces a spectrum for plotting by keeping the largest bin of each group, so no spur or
 * harmonic disappears however far the plot is reduced.
 *
 * @param spectrum - from windowedSpectrum
 * @param maxPoints - most points to return (≥ 1)
 * @returns frequencies (of the kept bins) and their levels in dBV
 */
export function spectrumPlot(spectrum: Spectrum, maxPoints = 4000): SpectrumPlot {
  const a = spectrum.amplitudeVpk;
  const perPoint = Math.max(1, Math.ceil(a.length / Math.max(1, Math.floor(maxPoints))));
  const frequencyHz: number[] = [];
  const dBV: number[] = [];
  for (let first = 0; first < a.length; first += perPoint) {
    const last = Math.min(a.length, first + perPoint);
    let best = first;
    for (let k = first + 1; k < last; k++) if (a[k] > a[best]) best = k;
    frequencyHz.push(best * spectrum.binHz);
    dBV.push(peakToDbv(a[best]));
  }
  return { frequencyHz, dBV, binsPerPoint: perPoint, binHz: spectrum.binHz, window: spectrum.window };
}
