/**
 * Robust statistics for figures that rest on a handful of builds: the median and the scaled median absolute
 * deviation, which one odd build (a bad solder joint, the wrong part) cannot drag far, unlike the mean and the
 * standard deviation. Pure: no I/O.
 *
 * Reference: NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.5.6 "Measures of Scale" (median absolute
 * deviation), and P. J. Rousseeuw and C. Croux, "Alternatives to the Median Absolute Deviation", Journal of the
 * American Statistical Association 88 (1993) 1273–1283, for the consistency factor 1.4826 ≈ 1/Φ⁻¹(3/4) that
 * makes the MAD estimate the standard deviation of normally spread values.
 */

/** 1/Φ⁻¹(0.75): the MAD times this estimates σ for a normal spread (Rousseeuw & Croux 1993). */
export const MAD_NORMAL_CONSISTENCY = 1.4826;

function checkValues(values: readonly number[], what: string): void {
  for (const v of values) {
    if (!Number.isFinite(v)) throw new RangeError(`${what} needs finite numbers; got ${v}`);
  }
}

/**
 * The median: the middle value, or the mean of the two middle values for an even count.
 *
 * @param values - finite numbers in any order (not changed).
 * @returns the median, or null for no values.
 * @throws RangeError when a value is not finite.
 */
export function median(values: readonly number[]): number | null {
  checkValues(values, "the median");
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/**
 * The median absolute deviation from the median, unscaled: median(|xᵢ − median(x)|).
 *
 * @returns in the unit of the values; null for no values; 0 for one value.
 * @throws RangeError when a value is not finite.
 */
export function medianAbsoluteDeviation(values: readonly number[]): number | null {
  const centre = median(values);
  if (centre === null) return null;
  return median(values.map((v) => Math.abs(v - centre)));
}

/**
 * The MAD scaled by {@link MAD_NORMAL_CONSISTENCY}: an estimate of the standard deviation that ignores a minority of
 * wild values.
 *
 * @returns in the unit of the values; null for fewer than two values (one value says nothing of the spread).
 * @throws RangeError when a value is not finite.
 */
export function scaledMad(values: readonly number[]): number | null {
  if (values.length < 2) {
    checkValues(values, "the scaled MAD");
    return null;
  }
  return MAD_NORMAL_CONSISTENCY * medianAbsoluteDeviation(values)!;
}

/** A robust summary of one figure across builds. */
export interface RobustSummary {
  /** How many values (builds) the summary rests on. */
  count: number;
  median: number | null;
  /** Scaled MAD, an estimate of σ between builds; null below two values. */
  scaledMad: number | null;
  /** Smallest and largest value: the spread between builds as observed. */
  min: number | null;
  max: number | null;
  /** max − min; 0 for one value, null for none. */
  range: number | null;
}

/**
 * Median, scaled MAD, count and observed range of a set of values.
 *
 * @param values - finite numbers (one per build), in any order.
 * @throws RangeError when a value is not finite.
 */
export function robustSummary(values: readonly number[]): RobustSummary {
  checkValues(values, "a robust summary");
  if (values.length === 0) return { count: 0, median: null, scaledMad: null, min: null, max: null, range: null };
  const min = Math.min(...values);
  const max = Math.max(...values);
  return { count: values.length, median: median(values), scaledMad: scaledMad(values), min, max, range: max - min };
}
