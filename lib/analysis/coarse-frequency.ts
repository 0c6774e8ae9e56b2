import { fitSine3 } from "./sine-fit";
import { coarsePeakHz, type Spectrum, windowedSpectrum } from "./spectrum";

/** Lowest tone searched, in periods per record: below about one period a sine and a DC slope look alike. */
const LOWEST_CYCLES = 0.75;
/** Grid step of the low search, in bins (1/record): the four-parameter fit converges from well within half a bin. */
const GRID_STEP_BINS = 0.05;
/** Share of the AC power the spectral candidate must explain to skip the low search. */
const EXPLAINED_ENOUGH = 0.9;

/** The start for the four-parameter fit, and how it was found. */
export interface CoarseFrequency {
  frequencyHz: number;
  /** "spectrum": the interpolated FFT peak; "low-search": the three-parameter fit's best over the lowest bins. */
  source: "spectrum" | "low-search";
}

function residualAt(y: Float64Array, sampleRateHz: number, frequencyHz: number): number {
  return fitSine3(y, sampleRateHz, frequencyHz).residualSumOfSquares;
}

/**
 * Coarse frequency of the strongest tone of a record, for a start of the four-parameter fit.
 *
 * The FFT peak search has to skip the window's DC lobe (about four bins either side of 0), so a
 * record of fewer than about five periods has its tone hidden there and the peak lands on noise or
 * a harmonic. When the spectral candidate does not explain most of the record's AC power, the
 * lowest bins are searched with three-parameter least-squares fits (IEEE Std 1057 §4.1.3.1) on a
 * fine grid, and the candidate that leaves the smaller residual wins: by that rule the fundamental
 * is the tone that carries the most power.
 *
 * @param y - the record (or its head) in volts
 * @param sampleRateHz - sample rate in Hz
 * @param spectrum - `windowedSpectrum(y, sampleRateHz)` when already computed (for example on another thread)
 * @returns the start frequency, or undefined when the record is flat
 */
export function coarseFrequency(y: Float64Array, sampleRateHz: number, spectrum = windowedSpectrum(y, sampleRateHz)): CoarseFrequency | undefined {
  const n = y.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += y[i];
  mean /= n;
  let acSumOfSquares = 0;
  for (let i = 0; i < n; i++) acSumOfSquares += (y[i] - mean) ** 2;
  if (!(acSumOfSquares > 0)) return undefined;

  const peakHz = coarsePeakHz(spectrum);
  const peakResidual = peakHz === undefined ? Infinity : residualAt(y, sampleRateHz, peakHz);
  if (peakHz !== undefined && peakResidual <= (1 - EXPLAINED_ENOUGH) * acSumOfSquares) {
    return { frequencyHz: peakHz, source: "spectrum" };
  }
  // The DC lobe spans the bins the peak search skips, plus one for its edge.
  const padding = spectrum.fftLength / spectrum.segmentLength;
  const highestCycles = (Math.ceil(spectrum.lobeHalfWidthBins * padding) + 2) / padding;
  const binHz = sampleRateHz / n;
  let bestHz = Number.NaN;
  let bestResidual = Infinity;
  for (let cycles = LOWEST_CYCLES; cycles <= highestCycles; cycles += GRID_STEP_BINS) {
    const residual = residualAt(y, sampleRateHz, cycles * binHz);
    if (residual < bestResidual) {
      bestResidual = residual;
      bestHz = cycles * binHz;
    }
  }
  if (peakHz !== undefined && peakResidual <= bestResidual) return { frequencyHz: peakHz, source: "spectrum" };
  return Number.isFinite(bestHz) ? { frequencyHz: bestHz, source: "low-search" } : undefined;
}
