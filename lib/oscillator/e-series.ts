/**
 * IEC 60063 preferred numbers, hard-coded because the standard rounds some values away from 10^(i/n)
 * (E24 has 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2 where the formula gives 2.6, 3.2, 3.5, 3.8, 4.2, 4.6, 8.3;
 * REFERENCES.md §5).
 * Sources: E6/E12/E24 as listed in REFERENCES.md §5 (IEC 60063, seen via the Wikipedia "E-series" page and
 * qsl.net/g4usp). E48/E96 from memory of IEC 60063; for these two every value equals round(10^(i/n), 2), which
 * the tests check, and E48 is every second E96 value.
 */

export type ESeriesName = "E6" | "E12" | "E24" | "E48" | "E96";

/** Mantissas in hundredths (100 = 1.00) so that decades are built from integers, not rounded floats. */
const SERIES_HUNDREDTHS: Record<ESeriesName, readonly number[]> = {
  E6: [100, 150, 220, 330, 470, 680],
  E12: [100, 120, 150, 180, 220, 270, 330, 390, 470, 560, 680, 820],
  E24: [
    100, 110, 120, 130, 150, 160, 180, 200, 220, 240, 270, 300, 330, 360, 390, 430, 470, 510, 560, 620, 680, 750, 820,
    910,
  ],
  E48: [
    100, 105, 110, 115, 121, 127, 133, 140, 147, 154, 162, 169, 178, 187, 196, 205, 215, 226, 237, 249, 261, 274, 287,
    301, 316, 332, 348, 365, 383, 402, 422, 442, 464, 487, 511, 536, 562, 590, 619, 649, 681, 715, 750, 787, 825, 866,
    909, 953,
  ],
  E96: [
    100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169,
    174, 178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294,
    301, 309, 316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453, 464, 475, 487, 499, 511,
    523, 536, 549, 562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887,
    909, 931, 953, 976,
  ],
};

export const E_SERIES_NAMES: readonly ESeriesName[] = ["E6", "E12", "E24", "E48", "E96"];

/** Values a hair off a preferred value (4.699999e-9 from arithmetic) count as that value. */
const SAME_VALUE_REL = 1e-9;

function checkSeries(series: string): asserts series is ESeriesName {
  if (!(series in SERIES_HUNDREDTHS)) {
    throw new RangeError(`E-series must be one of ${E_SERIES_NAMES.join(", ")}; got "${series}"`);
  }
}

function checkValue(value: number): void {
  if (!Number.isFinite(value) || value <= 0) {
    throw new RangeError(`a preferred value needs a finite value above 0; got ${value}`);
  }
}

/**
 * The series mantissas from 1 up to (not including) 10.
 *
 * @param series - E6, E12, E24, E48 or E96.
 * @returns e.g. E6 → [1, 1.5, 2.2, 3.3, 4.7, 6.8].
 * @throws RangeError for an unknown series name.
 */
export function eSeriesMantissas(series: ESeriesName): number[] {
  checkSeries(series);
  return SERIES_HUNDREDTHS[series].map((h) => h / 100);
}

/** The preferred value `hundredths/100 × 10^decade`, as the double nearest the decimal number. */
function valueAt(hundredths: number, decade: number): number {
  return Number(`${hundredths}e${decade - 2}`);
}

/** Candidates around `value`: the series in the decade below, the value's decade and the decade above. */
function neighbourhood(value: number, series: ESeriesName): number[] {
  const decade = Math.floor(Math.log10(value));
  const out: number[] = [];
  for (let d = decade - 1; d <= decade + 1; d++) {
    for (const h of SERIES_HUNDREDTHS[series]) out.push(valueAt(h, d));
  }
  return out;
}

function sameValue(a: number, b: number): boolean {
  return Math.abs(a - b) <= SAME_VALUE_REL * Math.max(Math.abs(a), Math.abs(b));
}

/**
 * The preferred value nearest to `value`, nearness measured as a ratio (|log(v/p)|), the natural distance for a
 * geometric series; a tie goes to the lower value.
 *
 * @param value - any positive value in SI units (e.g. 5.0e-9 F).
 * @param series - E6 … E96.
 * @returns the preferred value, e.g. nearestPreferred(5.0e-9, "E12") → 4.7e-9.
 * @throws RangeError when `value` is not finite and above 0, or for an unknown series.
 */
export function nearestPreferred(value: number, series: ESeriesName): number {
  checkSeries(series);
  checkValue(value);
  let best = NaN;
  let bestDistance = Infinity;
  for (const candidate of neighbourhood(value, series)) {
    const distance = Math.abs(Math.log(value / candidate));
    if (distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  return best;
}

/**
 * The smallest preferred value strictly above `value` (a value within 1e-9 relative of a preferred value counts as
 * that value, so nextAbove(4.7e-9) is 5.6e-9 in E12).
 *
 * @throws RangeError when `value` is not finite and above 0, or for an unknown series.
 */
export function nextAbove(value: number, series: ESeriesName): number {
  checkSeries(series);
  checkValue(value);
  const found = neighbourhood(value, series).find((c) => c > value && !sameValue(c, value));
  return found as number;
}

/**
 * The largest preferred value strictly below `value` (same 1e-9 relative rule as {@link nextAbove}).
 *
 * @throws RangeError when `value` is not finite and above 0, or for an unknown series.
 */
export function nextBelow(value: number, series: ESeriesName): number {
  checkSeries(series);
  checkValue(value);
  const below = neighbourhood(value, series).filter((c) => c < value && !sameValue(c, value));
  return below[below.length - 1];
}

/**
 * Whether `value` is a preferred value of the series (to 1e-9 relative), in any decade.
 *
 * @throws RangeError for an unknown series.
 */
export function isPreferred(value: number, series: ESeriesName): boolean {
  checkSeries(series);
  if (!Number.isFinite(value) || value <= 0) return false;
  return sameValue(nearestPreferred(value, series), value);
}

/**
 * Every preferred value from `minValue` to `maxValue` inclusive, in ascending order.
 *
 * @param minValue - lower limit, SI units, above 0.
 * @param maxValue - upper limit, SI units, at least `minValue`.
 * @throws RangeError for non-positive or reversed limits, or an unknown series.
 */
export function preferredValuesBetween(minValue: number, maxValue: number, series: ESeriesName): number[] {
  checkSeries(series);
  checkValue(minValue);
  checkValue(maxValue);
  if (maxValue < minValue) throw new RangeError(`the range is reversed: ${minValue} to ${maxValue}`);
  const out: number[] = [];
  const first = Math.floor(Math.log10(minValue)) - 1;
  const last = Math.floor(Math.log10(maxValue)) + 1;
  for (let d = first; d <= last; d++) {
    for (const h of SERIES_HUNDREDTHS[series]) {
      const v = valueAt(h, d);
      if ((v >= minValue || sameValue(v, minValue)) && (v <= maxValue || sameValue(v, maxValue))) out.push(v);
    }
  }
  return out;
}
