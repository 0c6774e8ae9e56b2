import { fitHarmonics } from "./harmonic-fit";
import { fitFrequencySigmaHz, fitSine4 } from "./sine-fit";
import { formatEngineering } from "../oscillator/units";
import type { Spur } from "./spurs";
import { describeTransient } from "./stability/describe";
import type { StabilityEnvelope } from "./stability/types";

/** Why a capture's figures may not be trusted. */
export type WarningCode =
  | "clipping"
  | "not-steady"
  | "few-cycles"
  | "low-oversampling"
  | "in-record-drift"
  | "no-dominant-tone"
  | "second-mode"
  | "sub-harmonic";

/** One trust warning: a stable code for programs and a plain sentence for people. */
export interface AnalysisWarning {
  code: WarningCode;
  message: string;
}

/** Fewer periods than this in the record and the harmonic and drift figures are shaky. */
export const MIN_CYCLES = 10;
/** Fewer samples per period than this and the waveform's shape is not captured (common practice). */
export const MIN_SAMPLES_PER_CYCLE = 5;
/** Relative envelope change across the record above which the oscillation is not steady. */
export const MAX_ENVELOPE_CHANGE = 0.1;
/**
 * Frequency difference between the first and last thirds, in combined standard deviations. The
 * statistic is calibrated (rms 1.0 over 300 noisy synthetic records), so 3 would give 0.3 % false
 * alarms; 4 also leaves room for the non-white error of a capture quantized without dither.
 */
export const DRIFT_SIGMAS = 4;
/** Below this many samples a period a clipped top is one or two samples wide, so flat runs cannot show it. */
export const RUNLESS_CLIPPING_BELOW_SAMPLES_PER_CYCLE = 10;
/** A non-harmonic tone within this many dB of the fundamental makes the frequency ambiguous. */
export const SECOND_MODE_WITHIN_DB = 10;
/** A sub-harmonic above this level (dBc) is period doubling worth a warning (common practice for the onset of squegging). */
export const SUB_HARMONIC_ABOVE_DBC = -40;
/**
 * Periodogram ordinates of white noise are exponential, so the largest of N/2 exceeds ln(N/2) + t
 * with probability about e^{−t} (Fisher's test for a hidden periodicity, 1929); t = 14 keeps false
 * "tone found" verdicts on pure noise below 10⁻⁶.
 */
const TONE_DETECTION_MARGIN = 14;

function percent(value: number): string {
  return `${(100 * value).toFixed(1)}%`;
}

/** Share of samples stuck at one extreme (in runs of three or more), and what an unclipped sine would leave there. */
export interface ClippingCheck {
  topFraction: number;
  bottomFraction: number;
  topExpected: number;
  bottomExpected: number;
  clippedTop: boolean;
  clippedBottom: boolean;
}

/**
 * Looks for flat tops: runs of samples sitting exactly at the record's maximum or minimum.
 *
 * Only runs of three or more count (every sample below 10 samples a period), so a coherent record that meets the same peak value once per
 * period is not mistaken for clipping. A quantized sine also dwells on its extreme code, so the
 * share in such runs is compared with what a sine of the record's amplitude spends within one code
 * step of its peak (θ/π with cos θ = 1 − step/A, the step being the gap to the next value inside
 * the extreme). Clipping is reported when the share is three times that and at least 0.5 %.
 *
 * @param y - the record in volts
 * @param samplesPerCycle - the fitted period in samples
 * @param extremes - the record's smallest and largest sample, when a caller has found them already
 * @returns the shares and the verdict for each extreme
 */
export function checkClipping(y: Float64Array, samplesPerCycle = Infinity, extremes?: { minV: number; maxV: number }): ClippingCheck {
  let min = Infinity;
  let max = -Infinity;
  if (extremes) ({ minV: min, maxV: max } = extremes);
  else {
    for (let i = 0; i < y.length; i++) {
      const v = y[i];
      if (v < min) min = v;
      if (v > max) max = v;
    }
  }
  const span = max - min;
  const none = { topFraction: 0, bottomFraction: 0, topExpected: 0, bottomExpected: 0, clippedTop: false, clippedBottom: false };
  if (!(span > 0)) return none;
  const tolerance = 1e-9 * span;
  const top = max - tolerance;
  const bottom = min + tolerance;
  // At a few samples a period a clipped top holds one or two samples at a time: count every sample
  // at the extreme then, and let the dwell comparison below tell clipping from a sine's own peaks.
  const minRun = samplesPerCycle < RUNLESS_CLIPPING_BELOW_SAMPLES_PER_CYCLE ? 1 : 3;
  let inTopRuns = 0;
  let inBottomRuns = 0;
  let topRun = 0;
  let bottomRun = 0;
  let belowTop = -Infinity;
  let aboveBottom = Infinity;
  for (let i = 0; i < y.length; i++) {
    const v = y[i];
    if (v >= top) topRun++;
    else {
      if (topRun >= minRun) inTopRuns += topRun;
      topRun = 0;
      if (v > belowTop) belowTop = v;
    }
    if (v <= bottom) bottomRun++;
    else {
      if (bottomRun >= minRun) inBottomRuns += bottomRun;
      bottomRun = 0;
      if (v < aboveBottom) aboveBottom = v;
    }
  }
  if (topRun >= minRun) inTopRuns += topRun;
  if (bottomRun >= minRun) inBottomRuns += bottomRun;
  const amplitude = span / 2;
  const dwell = (step: number) => Math.acos(Math.max(-1, 1 - Math.max(0, step) / amplitude)) / Math.PI;
  const topExpected = dwell(max - belowTop);
  const bottomExpected = dwell(aboveBottom - min);
  const topFraction = inTopRuns / y.length;
  const bottomFraction = inBottomRuns / y.length;
  const clipped = (fraction: number, expected: number) => fraction >= 0.005 && fraction > 3 * expected;
  return {
    topFraction,
    bottomFraction,
    topExpected,
    bottomExpected,
    clippedTop: clipped(topFraction, topExpected),
    clippedBottom: clipped(bottomFraction, bottomExpected),
  };
}

/** Amplitude of the fundamental in consecutive segments of the record. */
export interface EnvelopeCheck {
  segmentAmplitudesV: number[];
  /** (largest − smallest) / largest. */
  change: number;
  /** The change allowed before warning, 10 % plus a margin for the noise in each segment's estimate. */
  allowed: number;
}

/**
 * Measures how the fundamental's amplitude changes along the record (a start-up transient or a
 * dying oscillation), by three-parameter sine fits at the known frequency over 3 to 8 segments of
 * at least two periods each.
 *
 * @param y - the record with its distortion removed (so harmonics do not bias short fits), volts
 * @param sampleRateHz - sample rate in Hz
 * @param frequencyHz - the fundamental in Hz
 * @param noiseVrms - rms of the noise, for the margin
 * @returns the segment amplitudes and the change, or undefined when the record has under six periods
 */
export function checkEnvelope(
  y: Float64Array,
  sampleRateHz: number,
  frequencyHz: number,
  noiseVrms: number,
): EnvelopeCheck | undefined {
  const cycles = (frequencyHz * y.length) / sampleRateHz;
  const segments = Math.min(8, Math.floor(cycles / 2));
  if (segments < 3) return undefined;
  const length = Math.floor(y.length / segments);
  const amplitudes: number[] = [];
  const omega = (2 * Math.PI * frequencyHz) / sampleRateHz;
  for (let s = 0; s < segments; s++) {
    amplitudes.push(fitHarmonics(y, omega, 1, { start: s * length, length }).amplitudesVpk[0]);
  }
  const largest = Math.max(...amplitudes);
  const smallest = Math.min(...amplitudes);
  const change = largest > 0 ? (largest - smallest) / largest : 0;
  // Each segment's amplitude has a standard deviation of about σ·√(2/L).
  const margin = largest > 0 ? (4 * noiseVrms * Math.sqrt(2 / length)) / largest : 0;
  return { segmentAmplitudesV: amplitudes, change, allowed: MAX_ENVELOPE_CHANGE + margin };
}

/** Frequencies of the first and last thirds of the record, with their uncertainties. */
export interface DriftCheck {
  firstThirdHz: number;
  lastThirdHz: number;
  firstSigmaHz: number;
  lastSigmaHz: number;
  /** Last third minus first third, relative to the first, in ppm. */
  ppm: number;
  /** |difference| in combined standard deviations. */
  sigmas: number;
  drifting: boolean;
}

/**
 * Compares four-parameter fits of the first and last thirds of the record.
 *
 * @param y - the record with its distortion removed, volts
 * @param sampleRateHz - sample rate in Hz
 * @param frequencyHz - the whole record's frequency, as the starting point
 * @returns both fits' frequencies and uncertainties, and whether they differ by more than
 *   4 combined sigmas (and by more than 1e-9 relative, below which round-off rules)
 */
export function checkDrift(y: Float64Array, sampleRateHz: number, frequencyHz: number): DriftCheck {
  const third = Math.floor(y.length / 3);
  // Starting from the whole record's frequency, two Gauss–Newton steps are plenty for a third of it.
  const first = fitSine4(y, sampleRateHz, frequencyHz, { start: 0, length: third, maxIterations: 2 });
  const last = fitSine4(y, sampleRateHz, frequencyHz, { start: y.length - third, length: third, maxIterations: 2 });
  const firstSigmaHz = fitFrequencySigmaHz(first, sampleRateHz);
  const lastSigmaHz = fitFrequencySigmaHz(last, sampleRateHz);
  const difference = Math.abs(last.frequencyHz - first.frequencyHz);
  const combined = Math.hypot(firstSigmaHz, lastSigmaHz);
  const sigmas = combined > 0 ? difference / combined : difference > 0 ? Infinity : 0;
  return {
    firstThirdHz: first.frequencyHz,
    lastThirdHz: last.frequencyHz,
    firstSigmaHz,
    lastSigmaHz,
    ppm: ((last.frequencyHz - first.frequencyHz) / first.frequencyHz) * 1e6,
    sigmas,
    drifting: sigmas > DRIFT_SIGMAS && difference > 1e-9 * frequencyHz,
  };
}

/** Whether the fitted tone stands above the rest of the record. */
export interface ToneCheck {
  /** Periodogram statistic of the fitted tone, A²·N / (4·σ²) with σ² the variance of all that is not DC or fundamental. */
  statistic: number;
  /** What pure noise would reach with probability 10⁻⁶: ln(N/2) + 14. */
  threshold: number;
  /** Fundamental power over everything else that is not DC, dB (the SINAD). */
  toneOverRestDb: number;
  detected: boolean;
  dominant: boolean;
}

/**
 * Tells a tone from noise: a fitted sine's amplitude is large on any record, so the question is
 * whether it stands above what the largest periodogram line of pure noise would reach, and whether
 * it carries more power than everything else.
 *
 * @param fundamentalVpk - fitted amplitude
 * @param samples - record length
 * @param restVariance - per-sample variance of noise and distortion (all that is not DC or fundamental)
 */
export function checkTone(fundamentalVpk: number, samples: number, restVariance: number): ToneCheck {
  const statistic = restVariance > 0 ? (fundamentalVpk * fundamentalVpk * samples) / (4 * restVariance) : Infinity;
  const threshold = Math.log(samples / 2) + TONE_DETECTION_MARGIN;
  const toneOverRestDb = restVariance > 0 ? 10 * Math.log10((fundamentalVpk * fundamentalVpk) / 2 / restVariance) : Infinity;
  return { statistic, threshold, toneOverRestDb, detected: statistic > threshold, dominant: toneOverRestDb > 0 };
}

/** Inputs for {@link buildWarnings}: the figures already measured. */
export interface WarningInputs {
  cycles: number;
  samplesPerCycle: number;
  clipping: ClippingCheck;
  envelope?: EnvelopeCheck;
  drift?: DriftCheck;
  maxV: number;
  minV: number;
  tone?: ToneCheck;
  spurs?: readonly Spur[];
  frequencyHz?: number;
  /** The envelope's measured start-up or ring-down, added to the not-steady warning. */
  transient?: StabilityEnvelope;
}

// The not-steady code stays (a spec fails the record either way); a measured transient adds its figure.
function transientText(transient: StabilityEnvelope | undefined): string {
  const text = describeTransient(transient);
  return text ? ` ${text.charAt(0).toUpperCase()}${text.slice(1)}.` : "";
}

/**
 * Turns the checks into the warnings a technician sees, in a fixed order.
 * @returns zero or more warnings, each with a code and a one-sentence message
 */
export function buildWarnings(inputs: WarningInputs): AnalysisWarning[] {
  const warnings: AnalysisWarning[] = [];
  const { clipping, envelope, drift, tone } = inputs;
  if (tone && !(tone.detected && tone.dominant)) {
    warnings.push({
      code: "no-dominant-tone",
      message: tone.detected
        ? `No dominant tone: the fitted tone carries ${tone.toneOverRestDb.toFixed(1)} dB against everything else in the record, so frequency, amplitude and harmonics describe noise or several tones, not one oscillation.`
        : `No tone found: the strongest sine in the record stands no higher than noise alone would reach (statistic ${tone.statistic.toFixed(1)} against ${tone.threshold.toFixed(1)}), so the frequency is not a measurement; check the probe, the channel and that the oscillator runs.`,
    });
  }
  const secondMode = inputs.spurs?.find((s) => s.kind === "second-mode" && s.dBc !== null && s.dBc > -SECOND_MODE_WITHIN_DB);
  if (secondMode) {
    warnings.push({
      code: "second-mode",
      message: `A second tone at ${formatEngineering(secondMode.frequencyHz, "Hz", 4)} is only ${(-(secondMode.dBc as number)).toFixed(1)} dB below the one taken as the fundamental${inputs.frequencyHz ? ` (${formatEngineering(inputs.frequencyHz, "Hz", 4)}, the stronger)` : ""}: the circuit oscillates in two modes, and which one wins can change from run to run.`,
    });
  }
  const subHarmonic = inputs.spurs?.find((s) => s.kind === "sub-harmonic" && s.dBc !== null && s.dBc > SUB_HARMONIC_ABOVE_DBC);
  if (subHarmonic) {
    warnings.push({
      code: "sub-harmonic",
      message: `A sub-harmonic (${subHarmonic.label}) at ${formatEngineering(subHarmonic.frequencyHz, "Hz", 4)}, ${(subHarmonic.dBc as number).toFixed(1)} dBc: period doubling, often the onset of squegging (too much loop gain or a bias network that charges and discharges); the record is not one clean oscillation.`,
    });
  }
  if (clipping.clippedTop || clipping.clippedBottom) {
    const parts: string[] = [];
    if (clipping.clippedTop) parts.push(`${percent(clipping.topFraction)} of samples sit at the maximum ${inputs.maxV.toPrecision(4)} V`);
    if (clipping.clippedBottom) parts.push(`${percent(clipping.bottomFraction)} at the minimum ${inputs.minV.toPrecision(4)} V`);
    warnings.push({
      code: "clipping",
      message: `Flat tops: ${parts.join(" and ")}; the waveform looks clipped (scope range or circuit), so amplitude and harmonics are not trustworthy.`,
    });
  }
  if (envelope && envelope.change > envelope.allowed) {
    warnings.push({
      code: "not-steady",
      message: `The amplitude changes by ${percent(envelope.change)} across the record (${envelope.segmentAmplitudesV
        .map((a) => a.toPrecision(3))
        .join(", ")} V): a start-up transient or a dying oscillation; capture once it has settled.${transientText(inputs.transient)}`,
    });
  }
  if (inputs.cycles < MIN_CYCLES) {
    warnings.push({
      code: "few-cycles",
      message: `Only ${inputs.cycles.toFixed(1)} periods in the record (at least ${MIN_CYCLES} are needed for trustworthy harmonics and drift); use a longer time base.`,
    });
  }
  if (inputs.samplesPerCycle < MIN_SAMPLES_PER_CYCLE) {
    warnings.push({
      code: "low-oversampling",
      message: `Only ${inputs.samplesPerCycle.toFixed(1)} samples per period (at least ${MIN_SAMPLES_PER_CYCLE} are needed); raise the sample rate.`,
    });
  }
  if (drift?.drifting) {
    warnings.push({
      code: "in-record-drift",
      message: `The frequency moves within the record: first third ${drift.firstThirdHz.toPrecision(9)} Hz, last third ${drift.lastThirdHz.toPrecision(9)} Hz (${drift.ppm.toPrecision(3)} ppm, ${drift.sigmas.toFixed(1)} sigma); let the oscillator warm up.`,
    });
  }
  return warnings;
}
