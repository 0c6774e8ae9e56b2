import { describe, expect, it } from "vitest";
import { MAD_NORMAL_CONSISTENCY, median, medianAbsoluteDeviation, robustSummary, scaledMad } from "@/lib/layouts/robust-stats";

// Hand computations below follow the definitions in the NIST/SEMATECH e-Handbook of Statistical Methods,
// §1.3.5.6 (median absolute deviation) and Rousseeuw & Croux (1993) for the factor 1.4826.

describe("median", () => {
  it("odd_count_takes_the_middle_value", () => {
    expect(median([7, 1, 3])).toBe(3);
  });

  it("even_count_takes_the_mean_of_the_middle_two", () => {
    // Sorted 1, 2, 4, 10: (2 + 4)/2 = 3.
    expect(median([10, 2, 4, 1])).toBe(3);
  });

  it("does_not_reorder_its_input", () => {
    const values = [3, 1, 2];
    median(values);
    expect(values).toEqual([3, 1, 2]);
  });

  it("empty_input_gives_null", () => {
    expect(median([])).toBeNull();
  });

  it("rejects_a_non_finite_value", () => {
    expect(() => median([1, Number.NaN])).toThrow(/finite numbers; got NaN/);
  });
});

describe("medianAbsoluteDeviation", () => {
  it("matches_a_hand_computation", () => {
    // x = 2, 4, 4, 5, 7, 9, 30: median 5; |x − 5| = 3, 1, 1, 0, 2, 4, 25 → sorted 0, 1, 1, 2, 3, 4, 25: MAD 2.
    expect(medianAbsoluteDeviation([2, 4, 4, 5, 7, 9, 30])).toBe(2);
  });

  it("one_value_has_no_deviation", () => {
    expect(medianAbsoluteDeviation([4.2])).toBe(0);
  });
});

describe("scaledMad", () => {
  it("scales_the_mad_by_1_4826", () => {
    expect(MAD_NORMAL_CONSISTENCY).toBe(1.4826);
    // Picofarad-sized values as a layout figure would be: 10, 12, 13, 15, 40 pF.
    // Median 13 pF; |x − 13| = 3, 1, 0, 2, 27 → sorted 0, 1, 2, 3, 27: MAD 2 pF; scaled 2.9652 pF.
    const pF = 1e-12;
    const s = scaledMad([10 * pF, 12 * pF, 13 * pF, 15 * pF, 40 * pF]);
    expect(s).not.toBeNull();
    expect(Math.abs(s! - 2.9652 * pF)).toBeLessThan(1e-6 * pF);
  });

  it("one_wild_value_moves_it_far_less_than_the_standard_deviation", () => {
    const steady = [10, 11, 12, 13, 14];
    const withOutlier = [10, 11, 12, 13, 140];
    // Hand: both have median 12 and MAD 1, so the scaled MAD stays 1.4826 while the sample σ jumps.
    expect(scaledMad(steady)).toBeCloseTo(1.4826, 12);
    expect(scaledMad(withOutlier)).toBeCloseTo(1.4826, 12);
  });

  it("needs_two_values", () => {
    expect(scaledMad([5])).toBeNull();
    expect(scaledMad([])).toBeNull();
  });

  it("approaches_sigma_for_normal_values", () => {
    // Evenly spaced normal quantiles Φ⁻¹((i − ½)/n) for σ = 2: the scaled MAD should recover about 2.
    const n = 2001;
    const values = Array.from({ length: n }, (_, i) => 2 * inverseNormal((i + 0.5) / n));
    expect(Math.abs(scaledMad(values)! - 2)).toBeLessThan(0.01);
  });
});

describe("robustSummary", () => {
  it("gives_count_median_spread_and_range", () => {
    expect(robustSummary([3, 9, 6])).toEqual({ count: 3, median: 6, scaledMad: 3 * 1.4826, min: 3, max: 9, range: 6 });
  });

  it("empty_input_is_all_null_with_count_zero", () => {
    expect(robustSummary([])).toEqual({ count: 0, median: null, scaledMad: null, min: null, max: null, range: null });
  });

  it("one_value_has_a_range_of_zero_and_no_scaled_mad", () => {
    expect(robustSummary([7])).toEqual({ count: 1, median: 7, scaledMad: null, min: 7, max: 7, range: 0 });
  });
});

/** Φ⁻¹ by bisection on erf-based Φ (Abramowitz & Stegun 7.1.26 for erf, |error| < 1.5e-7). */
function inverseNormal(p: number): number {
  const phi = (x: number) => {
    const z = Math.abs(x) / Math.SQRT2;
    const t = 1 / (1 + 0.3275911 * z);
    const erf = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-z * z);
    return x >= 0 ? (1 + erf) / 2 : (1 - erf) / 2;
  };
  let lo = -10;
  let hi = 10;
  for (let i = 0; i < 100; i++) {
    const mid = (lo + hi) / 2;
    if (phi(mid) < p) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}
