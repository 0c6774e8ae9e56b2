/**
 * The per-capture stability figures stored with every analysis (engine ≥ 1.3.0): phase noise and
 * jitter from the record's phase residual, period jitter from its zero crossings, the Allan
 * deviation within the record, and the start-up or ring-down of its envelope. SI units; a figure
 * that cannot be measured is null with `reason` saying why, never 0.
 */

/** rms phase jitter over the offset band the record supports (IEEE Std 2414-2020 terms). */
export interface StabilityJitter {
  /**
   * √(2∫𝓛(f)df) over [bandLowHz, bandHighHz], radians. When `atFloor`, this is the floor itself:
   * an upper bound ("≤"), not a measurement.
   */
  rmsPhaseRad: number | null;
  /** rmsPhaseRad / (2π·f0), seconds. */
  rmsJitterS: number | null;
  bandLowHz: number | null;
  bandHighHz: number | null;
  /** The estimate does not stand clear of what the capture's additive noise and quantization alone give. */
  atFloor: boolean;
  /** What the floor alone integrates to over the same band, radians and seconds. */
  floorRmsPhaseRad: number | null;
  floorRmsJitterS: number | null;
  reason: string | null;
}

/** One phase-noise value 𝓛(f) at a decade offset. */
export interface PhaseNoisePoint {
  offsetHz: number;
  /** 𝓛(f) in dBc/Hz; when `atFloor`, the floor (the estimate reads "≤ floor"). */
  dbcPerHz: number;
  /** The raw estimate at this offset (it includes the floor's own share). */
  estimateDbcPerHz: number;
  floorDbcPerHz: number;
  atFloor: boolean;
  /** Approximate degrees of freedom of the estimate (2 per independent bin averaged). */
  dof: number;
}

/** The floor the capture's additive noise and quantization set on 𝓛(f). */
export interface PhaseNoiseFloor {
  /** The larger of the two below, dBc/Hz (white: the same at every offset). */
  dbcPerHz: number;
  /** From the amplitude-noise half of the residual: additive noise splits evenly between AM and PM. */
  additiveDbcPerHz: number;
  /** From the code step, q²/12 per sample; null when the record shows no quantization grid. */
  quantizationDbcPerHz: number | null;
  quantizationStepV: number | null;
  /** The additive noise that level stands for, V rms per sample over 0…fs/2. */
  additiveNoiseVrms: number;
}

export interface StabilityPhaseNoise {
  points: PhaseNoisePoint[];
  /** A tenth-decade curve for plotting (same estimator, same floor). */
  curve: { offsetHz: number[]; dbcPerHz: number[]; floorDbcPerHz: number[]; atFloor: boolean[] } | null;
  floor: PhaseNoiseFloor | null;
  reason: string | null;
}

/** Period and cycle-to-cycle jitter of the fundamental's rising zero crossings. */
export interface StabilityPeriodJitter {
  /** Periods measured (crossings − 1). */
  periods: number;
  /** Standard deviation of the periods, s (the floor when `atFloor`). */
  rmsPeriodJitterS: number | null;
  /** rms of the difference of adjacent periods, s (the floor when `atFloor`). */
  rmsCycleToCycleS: number | null;
  /** rmsPeriodJitterS / mean period. */
  rmsPeriodJitterFraction: number | null;
  meanPeriodS: number | null;
  /** What the additive noise alone gives, s. */
  floorRmsPeriodJitterS: number | null;
  floorRmsCycleToCycleS: number | null;
  atFloor: boolean;
  reason: string | null;
}

/** One overlapping Allan deviation with its 68 % interval. */
export interface AllanPoint {
  tauS: number;
  adev: number;
  lowerAdev: number;
  upperAdev: number;
  /** Overlapping second differences summed. */
  averages: number;
  /** Equivalent degrees of freedom behind the interval. */
  edf: number;
  /** What the additive noise alone gives (white PM: √3·σ_x/τ), and whether adev stands clear of it. */
  floorAdev: number;
  atFloor: boolean;
}

export interface StabilityAllan {
  points: AllanPoint[];
  /** How the interval was obtained (named so a reader can check it). */
  confidence: string;
  reason: string | null;
}

export type EnvelopeKind = "steady" | "start-up" | "ring-down" | "unknown";

/** The envelope's transient: start-up time and growth, or ring-down time constant and Q. */
export interface StabilityEnvelope {
  kind: EnvelopeKind;
  /** First visible oscillation to 90 % of the settled amplitude, s. */
  startUpS: number | null;
  /** Exponential growth rate of the envelope while small, 1/s. */
  growthPerS: number | null;
  /** Envelope e-folding time of a decay, s, and its 1σ. */
  decayTauS: number | null;
  decayTauSigmaS: number | null;
  /** Q = π·f0·τ and its 1σ. */
  q: number | null;
  qSigma: number | null;
  /** Settled amplitude (start-up) or amplitude at the start of the fit (ring-down), V peak. */
  settledVpk: number | null;
  /** The envelope per averaging block, thinned for drawing over the waveform (time of the block's centre); null when steady. */
  curve: { timeS: number[]; amplitudeVpk: number[] } | null;
  reason: string | null;
}

export interface StabilityResult {
  jitter: StabilityJitter;
  phaseNoise: StabilityPhaseNoise;
  periodJitter: StabilityPeriodJitter;
  allan: StabilityAllan;
  envelope: StabilityEnvelope;
  /** How the figures were obtained, one line each. */
  method: { phase: string; floor: string; periodJitter: string; allan: string; envelope: string };
}
