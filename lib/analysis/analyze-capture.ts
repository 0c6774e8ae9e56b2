import type { AnalysisMethod, AnalysisResult, CaptureAnalysis, Harmonic, Spur, TwoChannelResult } from "./analysis-result";
import { coarseFrequency } from "./coarse-frequency";
import type { Capture, CaptureChannel } from "./csv-import";
import { CaptureImportError } from "./errors";
import { formatSampleRate } from "./format-rate";
import { amplitudeRatioToDb, enobFromSinadDb, sfdrDb, thdFToThdR } from "./metrics";
import { type PlotData, peakToDbv, spectrumPlot, waveformEnvelope } from "./plot";
import { passesFrom } from "./record-passes";
import { fitSine4 } from "./sine-fit";
import { coarsePeakHz, type Spectrum, windowedSpectrum } from "./spectrum";
import { findSpurs, type KnownComponent, knownComponents, largestOtherBin } from "./spurs";
import { gainPhaseFromFits } from "./two-channel";
import { measureStability } from "./stability";
import { buildWarnings, SECOND_MODE_WITHIN_DB } from "./warnings";
import { ENGINE_VERSION } from "./version";

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
  /**
   * Computes the windowed spectrum of the record's head (its first 2^16 samples, or all of a
   * shorter record), where the coarse frequency comes from (default {@link windowedSpectrum});
   * asked for first, so a command's worker that is ready can spare the main thread its start-up.
   */
  headSpectrumOf?: (head: Float64Array, sampleRateHz: number) => Spectrum;
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
  const coarse = max > min ? coarseFrequency(head, sampleRateHz, options.headSpectrumOf?.(head, sampleRateHz)) : undefined;
  if (coarse === undefined) {
    throw new CaptureImportError("no oscillation found: the channel is flat");
  }
  const coarseHz = headLength === n ? coarse.frequencyHz : fitSine4(head, sampleRateHz, coarse.frequencyHz, { toleranceBins: 1e-2 }).frequencyHz;
  const t2 = now();

  // First pass: frequency from the raw record, harmonics there, and the record with them removed.
  // A milli-bin is close enough to take the harmonics out; the second fit does the fine work.
  // The statistics pass above summed y and y² just as the fit would: it need not do so again.
  const spanSums = { sum, sumOfSquares };
  const extremes = { minV: min, maxV: max };
  let first = fitSine4(y, sampleRateHz, coarseHz, { toleranceBins: 1e-3, spanSums });
  const t3 = now();
  const cleaned = new Float64Array(n);
  let passes = passesFrom(y, sampleRateHz, first, maxOrder, compare, cleaned, extremes);
  const t6 = now();
  // The whole record's spectrum is asked for only now, after the fits, so a caller computing it on
  // another thread has had all of them to do so.
  const spectrum = (options.spectrumOf ?? defaultSpectrum)(y, sampleRateHz, options.maxFftLength);
  const t6b = now();
  // A safety net for records whose head is not representative (say, a transient that dies early):
  // if the whole record's spectrum peaks elsewhere and a fit from there explains more, start again there.
  const fullPeakHz = coarsePeakHz(spectrum);
  if (fullPeakHz !== undefined && Math.abs(fullPeakHz - first.frequencyHz) > 3 * (sampleRateHz / spectrum.segmentLength)) {
    const again = fitSine4(y, sampleRateHz, fullPeakHz, { toleranceBins: 1e-3, spanSums });
    if (again.residualSumOfSquares < first.residualSumOfSquares) {
      first = again;
      passes = passesFrom(y, sampleRateHz, first, maxOrder, compare, cleaned, extremes);
    }
  }
  const t6c = now();
  const { fit, harmonicFit, compareFit, harmonics, thd, uncertainty, noiseVrms, sinad, snr, tone } = passes;
  const { cycles, samplesPerCycle, clipping, envelope, drift } = passes;
  const fundamentalVpk = harmonicFit.amplitudesVpk[0];
  const frequencyHz = fit.frequencyHz;

  const known = knownComponents(frequencyHz, fundamentalVpk, sampleRateHz, harmonics);
  const spurs = findSpurs(spectrum, frequencyHz, fundamentalVpk, known, maxOrder);
  const largestSpur = largestComponent(harmonics, spurs, spectrum, known, fundamentalVpk);

  const steady = envelope ? envelope.change <= envelope.allowed : undefined;
  const secondMode = spurs.find((s) => s.kind === "second-mode" && s.dBc !== null && s.dBc > -SECOND_MODE_WITHIN_DB);
  const stability = measureStability({
    samples: y,
    cleaned,
    sampleRateHz,
    startTimeS,
    tone: fit,
    frequencyHz,
    steady,
    dominantTone: tone.detected && tone.dominant,
    secondMode: secondMode ? { frequencyHz: secondMode.frequencyHz, dBc: secondMode.dBc as number } : undefined,
  });
  const warnings = buildWarnings({ cycles, samplesPerCycle, clipping, envelope, drift, maxV: max, minV: min, tone, spurs, frequencyHz, transient: stability.envelope });
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
          // Markers sit where the spectrum shows each order (folded above Nyquist), at the fitted level.
          harmonicMarkers: harmonicFit.orders.map((order, i) => ({
            order,
            frequencyHz: order === 1 ? frequencyHz : (harmonics.find((h) => h.order === order)?.seenAtHz ?? order * frequencyHz),
            dBV: peakToDbv(harmonicFit.amplitudesVpk[i]),
          })),
        };
  const t9 = now();

  const thdRatioValue = thd.ratio;
  const neededSampleRateHz = harmonics.some((h) => h.status === "not-separable") ? neededRate(frequencyHz, maxOrder) : null;
  const result: AnalysisResult = {
    engineVersion: ENGINE_VERSION,
    channel: options.channel ?? "",
    samples: n,
    sampleRateHz,
    recordS: n / sampleRateHz,
    frequencyHz,
    frequencyUncertaintyHz: uncertainty.statisticalHz,
    uncertainty,
    fundamentalVpk,
    fundamentalPhaseRad: fit.phaseRad,
    vpp: max - min,
    vrms: Math.sqrt(sumOfSquares / n),
    dcV: harmonicFit.dcV,
    meanV: sum / n,
    minV: min,
    maxV: max,
    thdPercent: thdRatioValue === null ? null : 100 * thdRatioValue,
    thdDb: thdRatioValue === null ? null : finiteOrNull(amplitudeRatioToDb(thdRatioValue)),
    thdRPercent: thdRatioValue === null ? null : 100 * thdFToThdR(thdRatioValue),
    thd: {
      status: thd.status,
      floorPercent: 100 * thd.floorRatio,
      upperBoundPercent: thd.status === "not-measurable" ? null : 100 * Math.hypot(thdRatioValue ?? 0, thd.floorRatio),
      detectedOrders: thd.detectedOrders,
      note: neededSampleRateHz === null ? thd.note : `${thd.note}; ${samplingAdvice(neededSampleRateHz, maxOrder)}`,
      neededSampleRateHz,
    },
    sinadDb: finiteOrNull(sinad),
    snrDb: finiteOrNull(snr),
    sfdrDb: largestSpur ? finiteOrNull(sfdrDb(fundamentalVpk, largestSpur.amplitudeVpk)) : null,
    enob: finiteOrNull(enobFromSinadDb(sinad)),
    noiseVrms,
    harmonicOrdersRequested: maxOrder,
    harmonics,
    spurs,
    largestSpur,
    tone: { ...tone, statistic: finiteOrNull(tone.statistic) ?? Number.MAX_VALUE, toneOverRestDb: finiteOrNull(tone.toneOverRestDb) },
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
    stability,
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
      // The wait for the whole record's spectrum (all of it when computed here), and the coarse head's.
      fftMs: t2 - t1 + (t6b - t6),
      fitMs: t3 - t2 + (t6c - t6b),
      // The passes after the first fit: harmonics, the second fit, the projections and their checks.
      harmonicsMs: t6 - t3,
      checksMs: t7 - t6c,
      twoChannelMs: t8 - t7,
      plotMs: t9 - t8,
    };
  }
  return analysis;
}

/**
 * A sample rate that keeps orders up to `maxOrder` clear below half of it: 2·H·f with 5 % to spare
 * (at exactly 2·H·f the top order sits on Nyquist), rounded up to two significant digits.
 */
function neededRate(frequencyHz: number, maxOrder: number): number {
  const raw = 2.1 * maxOrder * frequencyHz;
  const scale = 10 ** (Math.floor(Math.log10(raw)) - 1);
  return Math.ceil(Number((raw / scale).toPrecision(4))) * scale;
}

/** "sample at ≥ 4.2 MS/s to see harmonics up to 10" */
export function samplingAdvice(sampleRateHz: number, maxOrder: number): string {
  return `sample at ≥ ${formatSampleRate(sampleRateHz)} to see harmonics up to ${maxOrder}`;
}

/**
 * The component SFDR is measured against: the largest measured harmonic or listed spur, or when
 * neither is there the highest spectrum bin left (the noise's own peak).
 */
function largestComponent(harmonics: readonly Harmonic[], spurs: readonly Spur[], spectrum: Spectrum, known: readonly KnownComponent[], fundamentalVpk: number): Spur | null {
  let best: Spur | null = null;
  for (const h of harmonics) {
    if (h.status !== "measured" || h.amplitudeVpk === null) continue;
    if (!best || h.amplitudeVpk > best.amplitudeVpk) {
      best = {
        frequencyHz: h.seenAtHz,
        amplitudeVpk: h.amplitudeVpk,
        dBc: h.dBc,
        kind: "harmonic",
        label: h.folded ? `harmonic ${h.order} (folded)` : `harmonic ${h.order}`,
      };
    }
  }
  for (const s of spurs) if (!best || s.amplitudeVpk > best.amplitudeVpk) best = s;
  if (best) return best;
  const noisePeak = largestOtherBin(spectrum, known);
  if (!noisePeak) return null;
  return {
    ...noisePeak,
    dBc: finiteOrNull(amplitudeRatioToDb(noisePeak.amplitudeVpk / fundamentalVpk)),
    kind: "other",
    label: "the noise's highest bin",
  };
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
