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
}

/** A rule's outcome: inside its limit, outside it, or not decidable on this capture. */
export type CheckOutcome = "pass" | "fail" | "cannot-judge";

/** One evaluated rule. `margin` is positive inside the limit and negative outside, in `unit`. */
export interface SpecCheck {
  /** Stable rule id: frequency, thd, harmonic-<n>, amplitude, in-record-drift, warning-<code>. */
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
  /** Unit of measured, limit and margin: "%", "ppm", "dBc", "V", or "" for a warning. */
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
