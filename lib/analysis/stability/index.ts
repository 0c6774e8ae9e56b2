/**
 * Per-capture stability: phase noise and jitter from the phase residual against the fitted tone,
 * period jitter from zero crossings, the Allan deviation within the record, and the envelope's
 * start-up or ring-down. Pure: typed arrays in, a JSON-ready object out.
 */
import { formatEngineering } from "../../oscillator/units";
import { ALLAN_CONFIDENCE, MIN_ALLAN_BLOCKS, overlappingAllan } from "./allan";
import { demodulatePhase, type ReferenceTone } from "./demodulate";
import { measureEnvelope } from "./envelope";
import { periodJitter } from "./period-jitter";
import { phaseNoiseAndJitter } from "./phase-noise";
import { quantizationStepV } from "./quantization";
import type { StabilityResult } from "./types";

export type {
  AllanPoint,
  EnvelopeKind,
  PhaseNoiseFloor,
  PhaseNoisePoint,
  StabilityAllan,
  StabilityEnvelope,
  StabilityJitter,
  StabilityPeriodJitter,
  StabilityPhaseNoise,
  StabilityResult,
} from "./types";
export { demodulatePhase } from "./demodulate";
export type { PhaseResidual, ReferenceTone } from "./demodulate";
export { overlappingAllan, whiteFmEdf, chiSquareQuantile } from "./allan";
export { periodJitter, risingCrossings } from "./period-jitter";
export { phaseNoiseAndJitter, residualDensities, offsetBand, floorMargin } from "./phase-noise";
export { bandIntegral, hannPsd } from "./psd";
export { measureEnvelope } from "./envelope";
export { quantizationStepV } from "./quantization";

/** Fewer samples per period than this and one period's average cannot separate the carrier's image. */
export const MIN_STABILITY_SAMPLES_PER_CYCLE = 4;
/** Fewer periods than this and no offset band or Allan τ is left to report. */
export const MIN_STABILITY_PERIODS = 32;

/** Inputs of {@link measureStability}: what the engine has already computed. */
export interface StabilityInputs {
  /** The record as captured (for its code step). */
  samples: Float64Array;
  /** The record with DC and harmonics 2..H removed. */
  cleaned: Float64Array;
  sampleRateHz: number;
  /** Time of the first sample, s (for the drawn envelope). */
  startTimeS: number;
  /** The four-parameter fit of `cleaned`. */
  tone: ReferenceTone;
  frequencyHz: number;
  /** The envelope check's verdict: true steady, false not steady, undefined not run. */
  steady: boolean | undefined;
  /** Whether a single tone dominates the record (the no-dominant-tone check). */
  dominantTone: boolean;
  /**
   * A second mode close enough in level to raise its warning: the fundamental's phase then swings
   * with the two tones' beat, which is not jitter.
   */
  secondMode?: { frequencyHz: number; dBc: number };
  /** Highest offset for phase noise and jitter, Hz (default and cap: f0/4 and fs/2). */
  upperOffsetHz?: number;
}

export const STABILITY_METHOD: StabilityResult["method"] = {
  phase:
    "record demodulated against the fitted tone (tone removed before mixing), averaged over blocks of one period; Hann periodogram of the detrended phase, 𝓛(f) = S_φ(f)/2 and φ_rms = √(2∫𝓛 df), σ_t = φ_rms/(2π f0) (IEEE Std 2414-2020), over 1/T to min(fs/2, f0/4)",
  floor:
    "additive noise from the residual's AM density over the upper half of the band (white noise splits evenly between AM and PM), or q²/12 of the code step if larger; a value that does not clear the floor by max(1 dB, the 1 − 10⁻⁴ chi-square quantile of its estimate) reads as ≤ floor",
  periodJitter:
    "rising zero crossings of the fundamental (harmonics removed), each placed from its two samples as the fitted sine passes them; period jitter = std of periods, cycle-to-cycle = rms of adjacent differences (IEEE Std 2414-2020 terms)",
  allan: `overlapping Allan deviation (IEEE Std 1139-2008, NIST SP 1065) of the block phases as time error, at octave τ from ${MIN_ALLAN_BLOCKS} periods to a quarter of the record; ${ALLAN_CONFIDENCE}`,
  envelope:
    "fundamental amplitude per period; start-up: first visible oscillation to 90 % of the settled amplitude, growth = slope of ln A below half of it; ring-down: ln A fitted by weighted least squares, Q = π f0 τ",
};

function notMeasured(reason: string): Omit<StabilityResult, "envelope" | "method"> {
  return {
    jitter: {
      rmsPhaseRad: null,
      rmsJitterS: null,
      bandLowHz: null,
      bandHighHz: null,
      atFloor: false,
      floorRmsPhaseRad: null,
      floorRmsJitterS: null,
      reason,
    },
    phaseNoise: { points: [], curve: null, floor: null, reason },
    periodJitter: {
      periods: 0,
      rmsPeriodJitterS: null,
      rmsCycleToCycleS: null,
      rmsPeriodJitterFraction: null,
      meanPeriodS: null,
      floorRmsPeriodJitterS: null,
      floorRmsCycleToCycleS: null,
      atFloor: false,
      reason,
    },
    allan: { points: [], confidence: ALLAN_CONFIDENCE, reason },
  };
}

/**
 * Measures the record's stability figures (see {@link StabilityResult}). Phase noise, jitter,
 * period jitter and Allan deviation need one steady, dominant tone; on a start-up or ring-down
 * they are not measured (the transient would read as phase and amplitude noise) and the envelope's
 * figures are given instead.
 */
export function measureStability(inputs: StabilityInputs): StabilityResult {
  const { cleaned, sampleRateHz, tone, frequencyHz } = inputs;
  const samplesPerCycle = sampleRateHz / frequencyHz;
  const cycles = cleaned.length / samplesPerCycle;
  if (samplesPerCycle < MIN_STABILITY_SAMPLES_PER_CYCLE || cycles < 2) {
    const reason =
      samplesPerCycle < MIN_STABILITY_SAMPLES_PER_CYCLE
        ? `only ${samplesPerCycle.toFixed(1)} samples per period; the phase residual needs at least ${MIN_STABILITY_SAMPLES_PER_CYCLE}`
        : `only ${cycles.toFixed(1)} periods in the record`;
    return {
      ...notMeasured(reason),
      envelope: { kind: "unknown", startUpS: null, growthPerS: null, decayTauS: null, decayTauSigmaS: null, q: null, qSigma: null, settledVpk: null, curve: null, reason },
      method: STABILITY_METHOD,
    };
  }
  const residual = demodulatePhase(cleaned, tone, sampleRateHz);
  const envelope = measureEnvelope({
    amplitudeVpk: residual.amplitudeVpk,
    blockSamples: residual.blockSamples,
    sampleRateHz,
    startTimeS: inputs.startTimeS,
    frequencyHz,
    steady: inputs.steady,
  });
  let reason: string | null = null;
  // A transient first: a decaying or growing record also fails the dominance test against a fixed sine.
  if (inputs.steady === false) reason = "the amplitude is not steady (see the envelope): a transient would read as phase noise; capture once it has settled";
  else if (!inputs.dominantTone) reason = "no dominant tone in the record, so there is no carrier to measure the phase of";
  else if (inputs.secondMode) {
    const { frequencyHz: modeHz, dBc } = inputs.secondMode;
    reason = `a second mode at ${formatEngineering(modeHz, "Hz", 4)}, only ${(-dBc).toFixed(1)} dB below the fundamental, beats with it: the phase would measure that beat, not jitter`;
  } else if (residual.phaseRad.length < MIN_STABILITY_PERIODS) reason = `only ${residual.phaseRad.length} periods in the record; phase noise, jitter and Allan deviation need at least ${MIN_STABILITY_PERIODS}`;
  if (reason !== null) return { ...notMeasured(reason), envelope, method: STABILITY_METHOD };

  const step = quantizationStepV(inputs.samples);
  const { phaseNoise, jitter, additiveNoiseVrms } = phaseNoiseAndJitter({
    residual,
    frequencyHz,
    sampleRateHz,
    amplitudeVpk: tone.amplitudeV,
    quantizationStepV: step,
    upperOffsetHz: inputs.upperOffsetHz,
  });
  const periods = periodJitter(cleaned, sampleRateHz, tone.omegaRadPerSample, tone.amplitudeV, tone.offsetV, additiveNoiseVrms);
  const timeErrorS = new Float64Array(residual.phaseRad.length);
  const toSeconds = 1 / (2 * Math.PI * frequencyHz);
  for (let k = 0; k < timeErrorS.length; k++) timeErrorS[k] = residual.phaseRad[k] * toSeconds;
  // Additive noise of σ per sample leaves each block's phase an rms of σ·√(2/D)/A (the AM/PM split over D samples).
  const floorTimeErrorS = ((additiveNoiseVrms * Math.sqrt(2 / residual.blockSamples)) / tone.amplitudeV) * toSeconds;
  const allanPoints = overlappingAllan(timeErrorS, residual.blockSamples / sampleRateHz, MIN_ALLAN_BLOCKS, floorTimeErrorS);
  return {
    jitter,
    phaseNoise,
    periodJitter: periods,
    allan: {
      points: allanPoints,
      confidence: ALLAN_CONFIDENCE,
      reason: allanPoints.length === 0 ? `the record holds ${residual.phaseRad.length} periods; the shortest τ (${MIN_ALLAN_BLOCKS} periods) needs at least ${4 * MIN_ALLAN_BLOCKS + 1}` : null,
    },
    envelope,
    method: STABILITY_METHOD,
  };
}
