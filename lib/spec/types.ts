/** How a frequency tolerance is written: ±0.5 % or ±50 ppm. */
export type ToleranceUnit = "percent" | "ppm";

/**
 * A design's spec. Every limit is optional; a rule with no limit is not checked.
 * Levels follow the trade's sign convention: harmonics in dBc are negative, so a limit of −40 dBc means
 * "every harmonic at least 40 dB below the fundamental".
 */
export interface DesignSpec {
  /** Target oscillation frequency, Hz. */
  targetHz?: number | null;
  /** Half-width of the allowed frequency window around the target, in {@link toleranceUnit}. */
  toleranceValue?: number | null;
  toleranceUnit?: ToleranceUnit | null;
  /** Largest allowed THD (relative to the fundamental), %. */
  maxThdPercent?: number | null;
  /** Highest allowed level of any single harmonic, dBc (e.g. −40). */
  maxHarmonicDbc?: number | null;
  /** Smallest allowed fundamental amplitude, V peak (after the probe attenuation). */
  minFundamentalVpk?: number | null;
  /** Largest allowed frequency change within one record, ppm (absolute). */
  maxDriftPpm?: number | null;
  /** Largest allowed rms phase jitter of one capture, s (over the band the record supports). */
  maxRmsJitterS?: number | null;
  /** Largest allowed |pushing| of the build as it stands, ppm/V (a build-level rule, across runs). */
  maxPushingPpmPerV?: number | null;
  /** Largest allowed |temperature coefficient| of the build as it stands, ppm/K (a build-level rule, across runs). */
  maxTempcoPpmPerK?: number | null;
  /** The offset from the carrier at which phase noise is judged, Hz; the limit needs it. */
  phaseNoiseOffsetHz?: number | null;
  /** Highest allowed single-sideband phase noise at {@link phaseNoiseOffsetHz}, dBc/Hz (e.g. −100). */
  maxPhaseNoiseDbcPerHz?: number | null;
  /** Longest allowed start-up time (first visible oscillation to 90 % of the settled amplitude), s. */
  maxStartUpS?: number | null;
}

/**
 * The per-capture stability figures the rules read (a narrow view of the engine's result.stability); absent on
 * results from before they existed, which every stability rule then reads as "not measured".
 */
export interface StabilityMeasurements {
  jitter?: { rmsJitterS: number | null; atFloor: boolean; bandLowHz: number | null; bandHighHz: number | null; reason: string | null } | null;
  phaseNoise?: { points: ReadonlyArray<{ offsetHz: number; dbcPerHz: number; floorDbcPerHz: number; atFloor: boolean }>; reason: string | null } | null;
  envelope?: { kind: "steady" | "start-up" | "ring-down" | "unknown"; startUpS: number | null; reason: string | null } | null;
}

/** One across-runs slope as the build-level rules read it (lib/sensitivity's figure for the build as it stands). */
export type BuildSlopeMeasurement = { measured: true; ppm: number; ppmSigma: number; runs: number } | { measured: false; reason: string };

/** The build-level figures: pushing and temperature coefficient of the build's current state. */
export interface BuildSensitivityMeasurements {
  pushing: BuildSlopeMeasurement;
  tempco: BuildSlopeMeasurement;
}

/** What the evaluator needs from one analysed capture; a narrow view so the rules do not depend on the engine's shape. */
export interface SpecMeasurements {
  frequencyHz: number;
  /** Accuracy of the scope's timebase, ± ppm (the build's figure); absent or null when unknown. */
  timebasePpm?: number | null;
  thdPercent: number | null;
  /**
   * How THD came out (the engine's `thd`); absent for results from before detection limits, which are
   * judged on thdPercent alone.
   */
  thd?: {
    status: "measured" | "below-floor" | "not-measurable";
    upperBoundPercent: number | null;
    floorPercent: number;
    note: string | null;
    neededSampleRateHz: number | null;
  } | null;
  /** Harmonics by order; status and detectionLimitDbc are absent on older results (then every listed level counts as measured). */
  harmonics: ReadonlyArray<{
    order: number;
    dBc: number | null;
    status?: "measured" | "below-detection" | "not-separable";
    detectionLimitDbc?: number | null;
    folded?: boolean;
  }>;
  fundamentalVpk: number;
  /** Frequency change across the record, ppm (signed); null when the engine could not tell. */
  inRecordDriftPpm: number | null;
  warnings: ReadonlyArray<{ code: string; message: string }>;
  /** The capture's stability figures (result.stability); absent or null when the engine gave none. */
  stability?: StabilityMeasurements | null;
  /** The build's across-runs figures with this run included; absent or null when they were not computed. */
  buildSensitivity?: BuildSensitivityMeasurements | null;
}

/** A rule's outcome: inside its limit, outside it, or not decidable on this capture. */
export type CheckOutcome = "pass" | "fail" | "cannot-judge";

/** One evaluated rule. `margin` is positive inside the limit and negative outside, in `unit`. */
export interface SpecCheck {
  /** Stable rule id: frequency, thd, harmonic-<n>, amplitude, in-record-drift, rms-jitter, phase-noise, start-up, pushing, tempco, warning-<code>. */
  rule: string;
  /** True only for outcome "pass". */
  passed: boolean;
  /** Absent on checks stored before "cannot judge" existed (read them as pass or fail from `passed`). */
  outcome?: CheckOutcome;
  /** What would let the rule be judged ("sample at ≥ 4.2 MS/s to see harmonics up to 10"), for cannot-judge. */
  advice?: string | null;
  measured: number | null;
  limit: number | null;
  margin: number | null;
  /** Unit of measured, limit and margin: "%", "ppm", "dBc", "V", "s", "dBc/Hz", "ppm/V", "ppm/K", or "" for a warning. */
  unit: string;
  /** One plain sentence saying what was found against what was allowed. */
  message: string;
}

/** A run's verdict: "inconclusive" when nothing failed but some rule could not be judged (shown as "cannot judge"). */
export type RunVerdict = "pass" | "fail" | "inconclusive";

export interface SpecEvaluation {
  /** fail when any check failed, inconclusive when none failed but one could not be judged, pass when all passed, null when nothing was checked. */
  verdict: RunVerdict | null;
  checks: SpecCheck[];
}
