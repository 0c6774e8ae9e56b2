import { describe, expect, it } from "vitest";
import { compareRuns, type ComparableRun } from "@/lib/drift-trend/run-comparison";

function figures(over: Partial<ComparableRun> = {}): ComparableRun {
  return {
    measuredHz: 390_000,
    frequencyUncertaintyHz: 0.3,
    predictedHz: 369_000,
    driftPpm: 56_911,
    impliedExtraCapacitanceF: -190e-12,
    fundamentalVpk: 1.1,
    thdPercent: 1.7,
    worstHarmonicDbc: -36,
    sinadDb: 34,
    snrDb: 50,
    sfdrDb: 36,
    inRecordDriftPpm: 3,
    harmonics: [
      { order: 2, dBc: -36 },
      { order: 3, dBc: -44 },
    ],
    ...over,
  };
}

describe("compareRuns", () => {
  it("every_figure_has_a_row_with_b_minus_a", () => {
    const c = compareRuns(figures(), figures({ measuredHz: 382_600, thdPercent: 10.2 }));
    const byKey = Object.fromEntries(c.rows.map((r) => [r.key, r]));
    expect(byKey.measuredHz.change).toBeCloseTo(-7400, 9);
    expect(byKey.thdPercent.change).toBeCloseTo(8.5, 9);
    expect(byKey.thdPercent.better).toBe("a");
    expect(c.rows.map((r) => r.key)).toContain("harmonic-3");
  });

  it("the_frequency_change_in_ppm_and_its_significance", () => {
    // 390000 → 389999: −2.564 ppm; combined u = √(0.3² + 0.4²) = 0.5 Hz; 1 Hz > 2 × 0.5 Hz is false (edge equality).
    const c = compareRuns(figures({ frequencyUncertaintyHz: 0.3 }), figures({ measuredHz: 389_999, frequencyUncertaintyHz: 0.4 }));
    expect(c.frequencyChangePpm).toBeCloseTo((-1 / 390_000) * 1e6, 9);
    expect(c.frequencyChangeUncertaintyHz).toBeCloseTo(0.5, 12);
    expect(c.frequencyChangeSignificant).toBe(false);
    const moved = compareRuns(figures(), figures({ measuredHz: 389_998.9, frequencyUncertaintyHz: 0.4 }));
    expect(moved.frequencyChangeSignificant).toBe(true);
  });

  it("drift_is_better_closer_to_zero_whatever_its_sign", () => {
    const c = compareRuns(figures({ driftPpm: -500 }), figures({ driftPpm: 200 }));
    expect(c.rows.find((r) => r.key === "driftPpm")!.better).toBe("b");
  });

  it("sinad_is_better_higher", () => {
    const c = compareRuns(figures({ sinadDb: 30 }), figures({ sinadDb: 40 }));
    expect(c.rows.find((r) => r.key === "sinadDb")!.better).toBe("b");
  });

  it("changes_within_display_resolution_are_the_same", () => {
    const c = compareRuns(figures({ worstHarmonicDbc: -36.0 }), figures({ worstHarmonicDbc: -36.04 }));
    expect(c.rows.find((r) => r.key === "worstHarmonicDbc")!.better).toBe("same");
  });

  it("a_harmonic_only_one_run_has_shows_with_no_change", () => {
    const c = compareRuns(figures({ harmonics: [{ order: 2, dBc: -36 }] }), figures({ harmonics: [{ order: 2, dBc: -38 }, { order: 4, dBc: -60 }] }));
    const h4 = c.rows.find((r) => r.key === "harmonic-4")!;
    expect(h4).toMatchObject({ a: null, b: -60, change: null, better: null });
  });

  it("missing_figures_give_null_changes_and_no_significance", () => {
    const c = compareRuns(figures({ measuredHz: null }), figures());
    expect(c.rows.find((r) => r.key === "measuredHz")!.change).toBeNull();
    expect(c.frequencyChangePpm).toBeNull();
    expect(c.frequencyChangeSignificant).toBeNull();
  });

  it("frequency_has_no_better_side", () => {
    const c = compareRuns(figures(), figures({ measuredHz: 370_000 }));
    expect(c.rows.find((r) => r.key === "measuredHz")!.better).toBeNull();
  });

  const spec = { targetHz: 400_000, toleranceValue: 2, toleranceUnit: "percent" as const, maxThdPercent: 5, maxHarmonicDbc: -30 };

  it("judges_frequency_against_the_target_window_not_against_the_other_run", () => {
    // Window 400 kHz ± 2 % = 392..408 kHz. A at 391 kHz is outside, B at 407 kHz inside, though B moved further.
    const c = compareRuns(figures({ spec, measuredHz: 391_000 }), figures({ spec, measuredHz: 407_000 }));
    const f = c.rows.find((r) => r.key === "measuredHz")!;
    expect(f).toMatchObject({ basis: "target", within: { a: false, b: true }, better: "b" });
    const off = c.rows.find((r) => r.key === "offTargetPpm")!;
    expect(off.a).toBeCloseTo(-22_500, 6);
    expect(off.b).toBeCloseTo(17_500, 6);
    expect(off.better).toBe("b");
    expect(c.rows.find((r) => r.key === "targetHz")).toMatchObject({ a: 400_000, b: 400_000, better: null });
    // The prediction no longer decides anything once there is a target.
    expect(c.rows.find((r) => r.key === "driftPpm")!.better).toBeNull();
  });

  it("two_runs_on_the_same_side_of_a_spec_limit_are_the_same_however_far_apart", () => {
    const inside = compareRuns(figures({ spec, thdPercent: 4.9 }), figures({ spec, thdPercent: 0.2 }));
    expect(inside.rows.find((r) => r.key === "thdPercent")).toMatchObject({ basis: "spec", within: { a: true, b: true }, better: "same" });
    const outside = compareRuns(figures({ spec, harmonics: [{ order: 2, dBc: -20 }] }), figures({ spec, harmonics: [{ order: 2, dBc: -29.9 }] }));
    expect(outside.rows.find((r) => r.key === "harmonic-2")).toMatchObject({ within: { a: false, b: false }, better: "same" });
    const fixed = compareRuns(figures({ spec, thdPercent: 5.1 }), figures({ spec, thdPercent: 4.9 }));
    expect(fixed.rows.find((r) => r.key === "thdPercent")!.better).toBe("b");
  });

  it("figures_the_spec_does_not_cover_keep_their_direction", () => {
    const c = compareRuns(figures({ spec, sinadDb: 30 }), figures({ spec, sinadDb: 40 }));
    expect(c.rows.find((r) => r.key === "sinadDb")).toMatchObject({ basis: "direction", better: "b", within: null });
  });

  it("the_verdicts_rank_pass_over_cannot_judge_over_fail", () => {
    expect(compareRuns(figures({ verdict: "fail" }), figures({ verdict: "inconclusive" })).verdict).toEqual({ a: "fail", b: "inconclusive", better: "b" });
    expect(compareRuns(figures({ verdict: "pass" }), figures({ verdict: "pass" })).verdict.better).toBe("same");
    expect(compareRuns(figures({ verdict: "pass" }), figures()).verdict.better).toBeNull();
  });

  it("a_ppm_tolerance_sets_the_window_in_ppm", () => {
    const ppmSpec = { targetHz: 10e6, toleranceValue: 50, toleranceUnit: "ppm" as const };
    const c = compareRuns(figures({ spec: ppmSpec, measuredHz: 10e6 + 600 }), figures({ spec: ppmSpec, measuredHz: 10e6 + 400 }));
    expect(c.rows.find((r) => r.key === "measuredHz")!.within).toEqual({ a: false, b: true });
  });
});

describe("harmonics under the noise", () => {
  it("shows an undetected order as '< limit dBc' and one that could not be separated as such, never as a level", () => {
    const base = {
      measuredHz: 1e6, frequencyUncertaintyHz: 1, predictedHz: null, driftPpm: null, impliedExtraCapacitanceF: null, fundamentalVpk: 1,
      thdPercent: null, worstHarmonicDbc: null, sinadDb: null, snrDb: null, sfdrDb: null, inRecordDriftPpm: null,
    };
    const a = { ...base, harmonics: [{ order: 2, dBc: -40 }, { order: 3, dBc: null, detectionLimitDbc: -72, status: "below-detection" }] };
    const b = { ...base, harmonics: [{ order: 2, dBc: null, status: "not-separable" }, { order: 3, dBc: -50 }] };
    const rows = compareRuns(a, b).rows;
    expect(rows.find((r) => r.key === "harmonic-3")?.missing).toEqual({ a: "< −72.0 dBc", b: undefined });
    expect(rows.find((r) => r.key === "harmonic-2")?.missing).toEqual({ a: undefined, b: "not separable" });
  });
});
