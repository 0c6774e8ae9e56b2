import { describe, expect, it } from "vitest";
import {
  MIN_ALLOWANCE_F,
  classifyImpliedCapacitanceTrend,
  impliedCapacitanceSign,
  impliedCapacitanceUncertaintyF,
  type ImpliedCapacitancePoint,
} from "@/lib/drift-trend/implied-capacitance";
import { impliedExtraCapacitanceF } from "@/lib/oscillator/drift";

const pF = 1e-12;
const points = (values: Array<[number | null, number]>): ImpliedCapacitancePoint[] =>
  values.map(([v, segment]) => ({ impliedExtraCapacitanceF: v === null ? null : v * pF, segment }));

describe("impliedCapacitanceUncertaintyF", () => {
  it("matches_a_finite_difference_of_the_implied_capacitance", () => {
    // L 10 µH, C_eff 0.5 nF, measured 2.2 MHz ± 10 Hz: compare with the slope of lib/oscillator's own formula.
    const lH = 10e-6;
    const cEffF = 0.5e-9;
    const f = 2.2e6;
    const implied = impliedExtraCapacitanceF(lH, cEffF, f);
    const slope = (impliedExtraCapacitanceF(lH, cEffF, f + 1) - impliedExtraCapacitanceF(lH, cEffF, f - 1)) / 2;
    const sigma = impliedCapacitanceUncertaintyF(cEffF, implied, f, 10);
    expect(sigma).not.toBeNull();
    expect(sigma!).toBeCloseTo(Math.abs(slope) * 10, 20);
    expect(Math.abs(sigma! - Math.abs(slope) * 10) / sigma!).toBeLessThan(1e-6);
  });

  it("missing_or_out_of_range_inputs_give_null", () => {
    expect(impliedCapacitanceUncertaintyF(null, 1e-12, 1e6, 1)).toBeNull();
    expect(impliedCapacitanceUncertaintyF(1e-9, 1e-12, 0, 1)).toBeNull();
    expect(impliedCapacitanceUncertaintyF(1e-9, 1e-12, 1e6, -1)).toBeNull();
    expect(impliedCapacitanceUncertaintyF(1e-9, null, 1e6, 1)).toBeNull();
  });
});

describe("impliedCapacitanceSign", () => {
  it("positive_means_extra_capacitance_like_stray", () => {
    const s = impliedCapacitanceSign(3.2 * pF);
    expect(s.sign).toBe("more");
    expect(s.phrase).toMatch(/layout stray/);
  });
  it("negative_means_less_than_modelled_which_stray_cannot_cause", () => {
    const s = impliedCapacitanceSign(-12 * pF);
    expect(s.sign).toBe("less");
    expect(s.phrase).toMatch(/no stray can cause/);
  });
  it("near_zero_is_a_match", () => {
    expect(impliedCapacitanceSign(0.01 * pF).sign).toBe("none");
  });
  it("non_finite_is_a_range_error", () => {
    expect(() => impliedCapacitanceSign(Number.NaN)).toThrow(RangeError);
    expect(() => impliedCapacitanceSign(Number.NaN)).toThrow(/finite number of farads; got NaN/);
  });
});

describe("classifyImpliedCapacitanceTrend", () => {
  it("no_values_is_too_few_runs", () => {
    const t = classifyImpliedCapacitanceTrend(points([[null, 0]]));
    expect(t.verdict).toBe("too-few-runs");
    expect(t.typicalF).toBeNull();
    expect(t.summary).toMatch(/No analysed run/);
  });

  it("one_value_is_too_few_runs", () => {
    const t = classifyImpliedCapacitanceTrend(points([[22.5, 0]]));
    expect(t.verdict).toBe("too-few-runs");
    expect(t.summary).toMatch(/after the next tweak/);
  });

  it("runs_without_a_tweak_between_are_untested_with_their_repeatability", () => {
    // 22.0, 23.0: mean 22.5, sample sd = 0.7071 pF (hand-computed).
    const t = classifyImpliedCapacitanceTrend(points([[22, 0], [23, 0]]));
    expect(t.verdict).toBe("untested");
    expect(t.repeatabilityF! / pF).toBeCloseTo(Math.SQRT1_2, 9);
    expect(t.typicalF! / pF).toBeCloseTo(22.5, 9);
    expect(t.summary).toMatch(/\+22\.5 pF/);
  });

  it("a_value_that_holds_across_tweaks_is_a_layout_parasitic", () => {
    // Segment means 23.05, 24.43, 22.55, 22.04 pF (a perfboard Hartley, invented): spread 2.39 pF.
    const t = classifyImpliedCapacitanceTrend(points([[22.55, 0], [23.55, 0], [24.43, 1], [21.7, 2], [23.4, 2], [22.04, 3]]));
    expect(t.verdict).toBe("steady");
    expect(t.spreadF / pF).toBeCloseTo(24.43 - 22.04, 9);
    expect(t.spreadF).toBeLessThanOrEqual(t.allowanceF);
    expect(t.summary).toMatch(/layout parasitic — design it in/);
    expect(t.summary).toMatch(/across 3 tweaks/);
  });

  it("a_value_the_tweaks_moved_is_changing_with_its_largest_step", () => {
    // Means −195.9, −177.5, −188.4, −182.2 pF: spread 18.4 pF; 5 % of |−186| = 9.3 pF; pooled sd ≈ 1.5 pF.
    const t = classifyImpliedCapacitanceTrend(
      points([[-196.55, 0], [-194.93, 0], [-196.11, 0], [-177.55, 1], [-189.12, 2], [-187.59, 2], [-180.46, 3], [-184.02, 3]]),
    );
    expect(t.verdict).toBe("changing");
    expect(t.spreadF).toBeGreaterThan(t.allowanceF);
    expect(t.largestStep).toMatchObject({ fromSegment: 0, toSegment: 1 });
    expect(t.largestStep!.changeF / pF).toBeCloseTo(-177.55 - (-196.55 - 194.93 - 196.11) / 3, 9);
    expect(t.summary).toMatch(/the tweaks themselves moved it/);
  });

  it("a_steady_negative_value_points_at_the_parts_not_the_layout", () => {
    const t = classifyImpliedCapacitanceTrend(points([[-55.7, 0], [-55.96, 0], [-58.54, 1], [-55.92, 1]]));
    expect(t.verdict).toBe("steady");
    expect(t.summary).toMatch(/correcting the part values or the coil/);
    expect(t.summary).not.toMatch(/layout parasitic/);
  });

  it("the_allowance_never_drops_below_one_picofarad", () => {
    // Two perfectly repeatable segments 0.9 pF apart: inside the 1 pF floor.
    const t = classifyImpliedCapacitanceTrend(points([[3.0, 0], [3.0, 0], [3.9, 1], [3.9, 1]]));
    expect(t.allowanceF).toBe(MIN_ALLOWANCE_F);
    expect(t.verdict).toBe("steady");
  });

  it("edge_equality_of_spread_and_allowance_counts_as_steady", () => {
    // 0 pF and exactly 1 pF: typical 0.5 pF, 5 % of it is below the 1 pF floor, so spread = allowance = 1 pF.
    const t = classifyImpliedCapacitanceTrend([
      { impliedExtraCapacitanceF: 0, segment: 0 },
      { impliedExtraCapacitanceF: MIN_ALLOWANCE_F, segment: 1 },
    ]);
    expect(t.spreadF).toBe(MIN_ALLOWANCE_F);
    expect(t.allowanceF).toBe(MIN_ALLOWANCE_F);
    expect(t.verdict).toBe("steady");
  });

  it("measurement_uncertainty_widens_the_allowance", () => {
    const noisy = classifyImpliedCapacitanceTrend([
      { impliedExtraCapacitanceF: 10 * pF, uncertaintyF: 2 * pF, segment: 0 },
      { impliedExtraCapacitanceF: 16 * pF, uncertaintyF: 2 * pF, segment: 1 },
    ]);
    // 3 × √2 × 2 pF = 8.49 pF > 6 pF spread.
    expect(noisy.allowanceF / pF).toBeCloseTo(3 * Math.SQRT2 * 2, 9);
    expect(noisy.verdict).toBe("steady");
    const quiet = classifyImpliedCapacitanceTrend([
      { impliedExtraCapacitanceF: 10 * pF, uncertaintyF: 0.01 * pF, segment: 0 },
      { impliedExtraCapacitanceF: 16 * pF, uncertaintyF: 0.01 * pF, segment: 1 },
    ]);
    expect(quiet.verdict).toBe("changing");
  });

  it("a_non_integer_segment_is_a_range_error", () => {
    expect(() => classifyImpliedCapacitanceTrend([{ impliedExtraCapacitanceF: 1e-12, segment: 0.5 }])).toThrow(/segment must be an integer; got 0.5/);
  });
});
