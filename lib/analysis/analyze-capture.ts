import type { Capture, CaptureChannel, TimeSource } from "./csv-import";
import { CaptureImportError } from "./errors";
import { fitHarmonics, fitHarmonicsOfChannels } from "./harmonic-fit";
import { amplitudeRatioToDb, enobFromSinadDb, sfdrDb, sinadDb, thdFToThdR, thdRatio } from "./metrics";
import { type PlotData, peakToDbv, spectrumPlot, waveformEnvelope } from "./plot";
import { fitSine4 } from "./sine-fit";
import { coarsePeakHz, type Spectrum, windowedSpectrum } from "./spectrum";
import { type GainPhase, gainPhaseFromFits } from "./two-channel";
import { type AnalysisWarning, buildWarnings, checkClipping, checkDrift, checkEnvelope } from "./warnings";
import { ENGINE_VERSION } from "./version";

/** One harmonic of the fundamental. */
export interface Harmonic {
  /** 2, 3, … */
  order: number;
  frequencyHz: number;
  amplitudeVpk: number;
  /** Level relative to the fundamental, dB (null when the fit finds exactly nothing). */
  dBc: number | null;
}

/** The largest spectral component other than the fundamental and DC. */
export interface Spur {
  frequencyHz: number;
  amplitudeVpk: number;
  dBc: number | null;
  /** A fitted harmonic, or a spectral peak elsewhere (a higher or aliased harmonic, hum, interference). */
  kind: "harmonic" | "other";
}

/** The second channel against the analysed one, at the fundamental. */
export interface TwoChannelResult extends GainPhase {
  /** The analysed channel (the reference). */
  referenceChannel: string;
  /** The channel compared with it. */
  channel: string;
}

/** How the figures were obtained, for the run's record. */
export interface AnalysisMethod {
  spectrum: string;
  frequency: string;
  harmonics: string;
  noise: string;
}

/**
 * The numbers of one capture's analysis, in SI units (Hz, V, s; dB where named). Serialisable to
 * JSON as it stands: a dB figure that would be infinite is null.
 */
export interface AnalysisResult {
  engineVersion: string;
  /** Name of the analysed channel. */
  channel: string;
  samples: number;
  sampleRateHz: number;
  recordS: number;
  /** Fundamental frequency from the four-parameter sine fit. */
  frequencyHz: number;
  /** 1-sigma uncertainty of frequencyHz from the fit residual (white-noise model). */
  frequencyUncertaintyHz: number;
  fundamentalVpk: number;
  /** Phase of the fundamental at the first sample, radians (cosine reference). */
  fundamentalPhaseRad: number;
  vpp: number;
  /** Total rms, DC included. */
  vrms: number;
  /** DC offset from the least-squares fit (unbiased by a fractional last period, unlike the mean). */
  dcV: number;
  /** Plain mean of the samples. */
  meanV: number;
  minV: number;
  maxV: number;
  /** THD relative to the fundamental over the orders in `harmonics`, in %. */
  thdPercent: number;
  thdDb: number | null;
  /** THD relative to the total rms of fundamental and harmonics, in %. */
  thdRPercent: number;
  sinadDb: number | null;
  snrDb: number | null;
  sfdrDb: number | null;
  /** Effective number of bits, (SINAD − 1.76)/6.02: meaningful for a full-scale sine only. */
  enob: number | null;
  /** rms of what is left after DC, fundamental and harmonics are fitted out. */
  noiseVrms: number;
  /** Highest order asked for (the list holds those below Nyquist). */
  harmonicOrdersRequested: number;
  harmonics: Harmonic[];
  largestSpur: Spur | null;
  cycles: number;
  samplesPerCycle: number;
  /**
   * Frequency of the first and last thirds of the record (distortion removed), for a spec that limits the drift
   * within one capture; null when the record holds too few periods to fit its thirds.
   */
  inRecordDrift: InRecordDrift | null;
  warnings: AnalysisWarning[];
  twoChannel: TwoChannelResult | null;
  /** Preamble metadata of the file, when the result came from a capture. */
  metadata: Record<string, string>;
  /** Voltage channels the file holds. */
  channels: string[];
  timeSource: TimeSource | "samples";
  method: AnalysisMethod;
}

/** The in-record drift check's figures: last third minus first third, relative to the first, in ppm. */
export interface InRecordDrift {
  firstThirdHz: number;
  lastThirdHz: number;
  ppm: number;
  /** |difference| in combined standard deviations of the two fits; null when both fits are exact (no noise). */
  sigmas: number | null;
}

/** Wall time of each stage, milliseconds (only when asked for). */
export interface AnalysisTimings {
  statsMs: number;
  fftMs: number;
  fitMs: number;
  harmonicsMs: number;
  checksMs: number;
  twoChannelMs: number;
  plotMs: number;
}

/** What {@link analyzeCapture} returns: the numbers, and the plot data kept apart so JSON output can leave it out. */
export interface CaptureAnalysis {
  result: AnalysisResult;
  /** Plot data (empty arrays when `plot: false` was asked for). */
  plot: PlotData;
  timings?: AnalysisTimings;
}

/** Options for {@link analyzeCapture} and {@link analyzeSamples}. */
export interface AnalyzeOptions {
  /** Channel to analyse, by name or header (case-insensitive); default the first voltage column. */
  channel?: string;
  /** Highest harmonic order, default 10 (orders at or above Nyquist are skipped). */
  harmonics?: number;
  /** Channel to compare with the analysed one; default the next voltage column; false for none. */
  compareChannel?: string | false;
  /** Most points in the waveform envelope (default 2000). */
  waveformPoints?: number;
  /** Most points in the reduced spectrum (default 4000). */
  spectrumPoints?: number;
  /** Longest FFT before segment averaging (default 2^22). */
  maxFftLength?: number;
  /** Measure each stage's wall time. */
  collectTimings?: boolean;
  /** Build the plot data (default true); a command that prints only numbers can skip it. */
  plot?: boolean;
  /**
   * Computes the record's windowed spectrum (default {@link windowedSpectrum}). A command may hand
   * this to another thread and block here until it is done; it is asked for after the first fit.
   */
  spectrumOf?: (samples: Float64Array, sampleRateHz: number, maxFftLength: number | undefined) => Spectrum;
}

const METHOD: AnalysisMethod = {
  spectrum: "4-term Blackman-Harris window, mean removed, zero-padded to a power of two (segment-averaged beyond 2^22 samples)",
  frequency:
    "interpolated FFT peak, then IEEE 1057 four-parameter sine fit, refitted with the fitted harmonics removed; 1-sigma from the residual",
  harmonics: "multi-harmonic least-squares fit at the fitted frequency over the whole record",
  noise: "time-domain residual of the harmonic fit (IEEE 1241 SNR and SINAD)",
};

const EMPTY_PLOT: PlotData = {
  waveform: { timeS: [], minV: [], maxV: [], samplesPerPoint: 0 },
  spectrum: { frequencyHz: [], dBV: [], binsPerPoint: 0, binHz: 0, window: "" },
  harmonicMarkers: [],
};

function finiteOrNull(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

function findChannel(channels: CaptureChannel[], wanted: string): CaptureChannel | undefined {
  const key = wanted.trim().toLowerCase();
  return channels.find((c) => c.name.toLowerCase() === key) ?? channels.find((c) => c.header.toLowerCase() === key);
}

const now = () => performance.now();

// 2^16 samples: a 5 ms FFT, and a head long enough to place the tone within a bin of the whole record.
const COARSE_HEAD_SAMPLES = 1 << 16;

function defaultSpectrum(samples: Float64Array, sampleRateHz: number, maxFftLength: number | undefined): Spectrum {
  return windowedSpectrum(samples, sampleRateHz, { maxFftLength });
}

/**
 * Analyses one record: frequency (with its uncertainty), amplitude, DC, harmonics, THD, SINAD,
 * SNR, SFDR, ENOB, trust warnings and plot data.
 *
 * @param y - samples in volts (at least 64)
 * @param sampleRateHz - sample rate in Hz
 * @param options - see {@link AnalyzeOptions}; `channel` names the record in the result
 * @returns the analysis; `twoChannel` is null (see {@link analyzeCapture} for two channels)
 * @throws CaptureImportError when the record holds no oscillation (a flat or empty channel)
 * @throws RangeError when the sample rate is not positive or the harmonic count not an integer ≥ 1
 */
export function analyzeSamples(y: Float64Array, sampleRateHz: number, options: AnalyzeOptions = {}): CaptureAnalysis {
  return analyzeRecord(y, sampleRateHz, 0, options, undefined);
}

function analyzeRecord(
  y: Float64Array,
  sampleRateHz: number,
  startTimeS: number,
  options: AnalyzeOptions,
  compare: CaptureChannel | undefined,
): CaptureAnalysis {
  if (!(sampleRateHz > 0) || !Number.isFinite(sampleRateHz)) {
    throw new RangeError(`sample rate must be a positive number of Hz, got ${sampleRateHz}`);
  }
  const maxOrder = options.harmonics ?? 10;
  if (!Number.isInteger(maxOrder) || maxOrder < 1) {
    throw new RangeError(`harmonics must be an integer ≥ 1, got ${maxOrder}`);
  }
  const n = y.length;
  if (n < 64) throw new CaptureImportError(`only ${n} samples; at least 64 are needed for an analysis`);
  const t0 = now();

  let min = Infinity;
  let max = -Infinity;
  let sum = 0;
  let sumOfSquares = 0;
  for (let i = 0; i < n; i++) {
    const v = y[i];
    if (v < min) min = v;
    if (v > max) max = v;
    sum += v;
    sumOfSquares += v * v;
  }
  const t1 = now();

  // The coarse frequency comes from the head of the record, refined by a sine fit there, so the
  // full spectrum is not needed until the end (a caller may compute it on another thread). The
  // head's fit is good to a small fraction of the whole record's bin, where Gauss–Newton converges.
  const headLength = Math.min(n, COARSE_HEAD_SAMPLES);
  const head = headLength === n ? y : y.subarray(0, headLength);
  const headPeakHz = max > min ? coarsePeakHz(windowedSpectrum(head, sampleRateHz)) : undefined;
  if (headPeakHz === undefined) {
    throw new CaptureImportError("no oscillation found: the channel is flat");
  }
  const coarseHz = headLength === n ? headPeakHz : fitSine4(head, sampleRateHz, headPeakHz, { toleranceBins: 1e-2 }).frequencyHz;
  const t2 = now();

  // First pass: frequency from the raw record, harmonics there, and the record with them removed.
  // A milli-bin is close enough to take the harmonics out; the second fit does the fine work.
  let first = fitSine4(y, sampleRateHz, coarseHz, { toleranceBins: 1e-3 });
  const t3 = now();
  const spectrum = (options.spectrumOf ?? defaultSpectrum)(y, sampleRateHz, options.maxFftLength);
  // A safety net for records whose head is not representative (say, a transient that dies early):
  // if the whole record's spectrum peaks elsewhere, start again from there.
  const fullPeakHz = coarsePeakHz(spectrum);
  if (fullPeakHz !== undefined && Math.abs(fullPeakHz - first.frequencyHz) > 3 * (sampleRateHz / spectrum.segmentLength)) {
    first = fitSine4(y, sampleRateHz, fullPeakHz, { toleranceBins: 1e-3 });
  }
  const t3b = now();
  const cleaned = new Float64Array(n);
  fitHarmonics(y, first.omegaRadPerSample, maxOrder, { cleanedOut: cleaned });
  const t4 = now();
  // Second pass: harmonics leak into a single-sine fit and bias it; fitting the cleaned record removes that.
  const fit = fitSine4(cleaned, sampleRateHz, first.frequencyHz);
  const t5 = now();
  // The compared channel shares the pass: same frequency, same columns.
  const [harmonicFit, compareFit] = fitHarmonicsOfChannels(compare ? [y, compare.samples] : [y], fit.omegaRadPerSample, maxOrder);
  const t6 = now();

  const fundamentalVpk = harmonicFit.amplitudesVpk[0];
  const frequencyHz = fit.frequencyHz;
  const harmonics: Harmonic[] = harmonicFit.orders.slice(1).map((order, i) => {
    const amplitudeVpk = harmonicFit.amplitudesVpk[i + 1];
    return { order, frequencyHz: order * frequencyHz, amplitudeVpk, dBc: finiteOrNull(amplitudeRatioToDb(amplitudeVpk / fundamentalVpk)) };
  });
  const thd = fundamentalVpk > 0 ? thdRatio(fundamentalVpk, harmonics.map((h) => h.amplitudeVpk)) : 0;
  const dof = Math.max(1, n - harmonicFit.parameters - 1);
  const noiseVariance = harmonicFit.noiseSumOfSquares / dof;
  const frequencyUncertaintyHz = (sampleRateHz / (2 * Math.PI)) * Math.sqrt(Math.max(0, noiseVariance * fit.omegaVarianceFactor));
  const signalRms = fundamentalVpk / Math.SQRT2;
  const noiseVrms = Math.sqrt(harmonicFit.noiseSumOfSquares / n);
  const nadRms = Math.sqrt(harmonicFit.noiseAndDistortionSumOfSquares / n);
  const sinad = sinadDb(signalRms, nadRms);
  const snr = sinadDb(signalRms, noiseVrms);

  // Largest spur: the biggest fitted harmonic, or a spectral peak away from DC, the fundamental and the fitted harmonics.
  let spur: Spur | null = null;
  for (const h of harmonics) {
    if (!spur || h.amplitudeVpk > spur.amplitudeVpk) spur = { frequencyHz: h.frequencyHz, amplitudeVpk: h.amplitudeVpk, dBc: h.dBc, kind: "harmonic" };
  }
  const padding = spectrum.fftLength / spectrum.segmentLength;
  const guard = Math.ceil((spectrum.lobeHalfWidthBins + 1) * padding);
  const excluded = new Uint8Array(spectrum.amplitudeVpk.length);
  const exclude = (centreBin: number) => {
    const lo = Math.max(0, Math.floor(centreBin) - guard);
    const hi = Math.min(excluded.length - 1, Math.ceil(centreBin) + guard);
    for (let k = lo; k <= hi; k++) excluded[k] = 1;
  };
  exclude(0);
  for (const order of harmonicFit.orders) exclude((order * frequencyHz) / spectrum.binHz);
  let spurBin = -1;
  for (let k = 0; k < excluded.length; k++) {
    if (!excluded[k] && (spurBin < 0 || spectrum.amplitudeVpk[k] > spectrum.amplitudeVpk[spurBin])) spurBin = k;
  }
  if (spurBin >= 0 && (!spur || spectrum.amplitudeVpk[spurBin] > spur.amplitudeVpk)) {
    const amplitudeVpk = spectrum.amplitudeVpk[spurBin];
    spur = {
      frequencyHz: spurBin * spectrum.binHz,
      amplitudeVpk,
      dBc: finiteOrNull(amplitudeRatioToDb(amplitudeVpk / fundamentalVpk)),
      kind: "other",
    };
  }

  const cycles = (frequencyHz * n) / sampleRateHz;
  const samplesPerCycle = sampleRateHz / frequencyHz;
  const clipping = checkClipping(y);
  const envelope = checkEnvelope(cleaned, sampleRateHz, frequencyHz, noiseVrms);
  const drift = cycles >= 6 ? checkDrift(cleaned, sampleRateHz, frequencyHz) : undefined;
  const warnings = buildWarnings({ cycles, samplesPerCycle, clipping, envelope, drift, maxV: max, minV: min });
  const t7 = now();

  let twoChannel: TwoChannelResult | null = null;
  if (compare) {
    const gp = gainPhaseFromFits(harmonicFit, compareFit);
    twoChannel = { ...gp, referenceChannel: options.channel ?? "", channel: compare.name };
  }
  const t8 = now();

  const plot: PlotData =
    options.plot === false
      ? EMPTY_PLOT
      : {
          waveform: waveformEnvelope(y, sampleRateHz, startTimeS, options.waveformPoints ?? 2000),
          spectrum: spectrumPlot(spectrum, options.spectrumPoints ?? 4000),
          harmonicMarkers: harmonicFit.orders.map((order, i) => ({
            order,
            frequencyHz: order * frequencyHz,
            dBV: peakToDbv(harmonicFit.amplitudesVpk[i]),
          })),
        };
  const t9 = now();

  const result: AnalysisResult = {
    engineVersion: ENGINE_VERSION,
    channel: options.channel ?? "",
    samples: n,
    sampleRateHz,
    recordS: n / sampleRateHz,
    frequencyHz,
    frequencyUncertaintyHz,
    fundamentalVpk,
    fundamentalPhaseRad: fit.phaseRad,
    vpp: max - min,
    vrms: Math.sqrt(sumOfSquares / n),
    dcV: harmonicFit.dcV,
    meanV: sum / n,
    minV: min,
    maxV: max,
    thdPercent: 100 * thd,
    thdDb: finiteOrNull(amplitudeRatioToDb(thd)),
    thdRPercent: 100 * thdFToThdR(thd),
    sinadDb: finiteOrNull(sinad),
    snrDb: finiteOrNull(snr),
    sfdrDb: spur ? finiteOrNull(sfdrDb(fundamentalVpk, spur.amplitudeVpk)) : null,
    enob: finiteOrNull(enobFromSinadDb(sinad)),
    noiseVrms,
    harmonicOrdersRequested: maxOrder,
    harmonics,
    largestSpur: spur,
    cycles,
    samplesPerCycle,
    inRecordDrift: drift
      ? {
          firstThirdHz: drift.firstThirdHz,
          lastThirdHz: drift.lastThirdHz,
          ppm: drift.ppm,
          sigmas: finiteOrNull(drift.sigmas),
        }
      : null,
    warnings,
    twoChannel,
    metadata: {},
    channels: [],
    timeSource: "samples",
    method: METHOD,
  };
  const analysis: CaptureAnalysis = { result, plot };
  if (options.collectTimings) {
    analysis.timings = {
      statsMs: t1 - t0,
      fftMs: t2 - t1 + (t3b - t3),
      fitMs: t3 - t2 + (t5 - t4),
      harmonicsMs: t4 - t3b + (t6 - t5),
      checksMs: t7 - t6,
      twoChannelMs: t8 - t7,
      plotMs: t9 - t8,
    };
  }
  return analysis;
}

/**
 * The channels {@link analyzeCapture} will use: the one analysed and the one compared with it.
 * @throws CaptureImportError when a named channel is not in the capture
 */
export function analysisChannels(capture: Capture, options: AnalyzeOptions = {}): { channel: CaptureChannel; compare?: CaptureChannel } {
  const names = capture.channels.map((c) => c.name);
  let channel = capture.channels[0];
  if (options.channel !== undefined) {
    const found = findChannel(capture.channels, options.channel);
    if (!found) throw new CaptureImportError(`no channel named '${options.channel}'; the capture has ${names.join(", ")}`);
    channel = found;
  }
  let compare: CaptureChannel | undefined;
  if (typeof options.compareChannel === "string") {
    compare = findChannel(capture.channels, options.compareChannel);
    if (!compare) throw new CaptureImportError(`no channel named '${options.compareChannel}' to compare; the capture has ${names.join(", ")}`);
  } else if (options.compareChannel !== false) {
    compare = capture.channels.find((c) => c !== channel);
  }
  return { channel, compare: compare === channel ? undefined : compare };
}

/**
 * Analyses a capture: one channel in full, and the next channel's gain and phase against it.
 *
 * @param capture - from {@link importCapture} or {@link CaptureImporter}
 * @param options - see {@link AnalyzeOptions}
 * @returns the numbers (`result`, JSON-ready) and the plot data (`plot`)
 * @throws CaptureImportError when the named channel is not in the capture, or the channel holds
 *   no oscillation
 * @throws RangeError for an invalid harmonic count
 * @example
 * const { result } = analyzeCapture(importCapture(bytes), { channel: "Out", harmonics: 10 });
 * console.log(result.frequencyHz, result.frequencyUncertaintyHz, result.thdPercent);
 */
export function analyzeCapture(capture: Capture, options: AnalyzeOptions = {}): CaptureAnalysis {
  const names = capture.channels.map((c) => c.name);
  const { channel, compare } = analysisChannels(capture, options);
  const analysis = analyzeRecord(channel.samples, capture.sampleRateHz, capture.startTimeS, { ...options, channel: channel.name }, compare);
  analysis.result.metadata = capture.metadata;
  analysis.result.channels = names;
  analysis.result.timeSource = capture.timeSource;
  return analysis;
}
