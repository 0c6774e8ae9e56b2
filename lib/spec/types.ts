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
  thdPercent: number | null;
  harmonics: ReadonlyArray<{ order: number; dBc: number | null }>;
  fundamentalVpk: number;
  /** Frequency change across the record, ppm (signed); null when the engine could not tell. */
  inRecordDriftPpm: number | null;
  warnings: ReadonlyArray<{ code: string; message: string }>;
}

/** One evaluated rule. `margin` is positive inside the limit and negative outside, in `unit`. */
export interface SpecCheck {
  /** Stable rule id: frequency, thd, harmonic-<n>, amplitude, in-record-drift, warning-<code>. */
  rule: string;
  passed: boolean;
  measured: number | null;
  limit: number | null;
  margin: number | null;
  /** Unit of measured, limit and margin: "%", "ppm", "dBc", "V", or "" for a warning. */
  unit: string;
  /** One plain sentence saying what was found against what was allowed. */
  message: string;
}

export interface SpecEvaluation {
  /** pass when every check passed, fail when any failed, null when nothing was checked. */
  verdict: "pass" | "fail" | null;
  checks: SpecCheck[];
}
