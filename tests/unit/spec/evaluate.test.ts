import { describe, expect, it } from "vitest";
import { evaluateSpec, hasAnyLimit } from "@/lib/spec/evaluate";
import type { SpecMeasurements } from "@/lib/spec/types";

// Hand-computed cases: every expected number below is worked out in the comment beside it.
function measured(over: Partial<SpecMeasurements> = {}): SpecMeasurements {
  return {
    frequencyHz: 390_000,
    thdPercent: 1.2,
    harmonics: [
      { order: 2, dBc: -38.5 },
      { order: 3, dBc: -45 },
    ],
    fundamentalVpk: 1.5,
    inRecordDriftPpm: 12,
    warnings: [],
    ...over,
  };
}

describe("evaluateSpec", () => {
  it("frequency_inside_percent_tolerance_passes_with_positive_margin", () => {
    // (390 000 − 388 000) / 388 000 = +0.515464 %; margin = 1 − 0.515464 = 0.484536 %
    const r = evaluateSpec({ targetHz: 388_000, toleranceValue: 1, toleranceUnit: "percent" }, measured());
    expect(r.verdict).toBe("pass");
    const [check] = r.checks;
    expect(check.rule).toBe("frequency");
    expect(check.measured).toBeCloseTo(0.515464, 5);
    expect(check.margin).toBeCloseTo(0.484536, 5);
    expect(check.unit).toBe("%");
    expect(check.message).toMatch(/\+0\.515 %.*inside by 0\.485 %/);
  });

  it("frequency_outside_ppm_tolerance_fails_with_negative_margin", () => {
    // (390 000 − 370 000) / 370 000 = 54 054.05 ppm; margin = 500 − 54 054.05 = −53 554.05 ppm
    const r = evaluateSpec({ targetHz: 370_000, toleranceValue: 500, toleranceUnit: "ppm" }, measured());
    expect(r.verdict).toBe("fail");
    expect(r.checks[0].measured).toBeCloseTo(54_054.054, 2);
    expect(r.checks[0].margin).toBeCloseTo(-53_554.054, 2);
    expect(r.checks[0].message).toMatch(/outside by 53554 ppm/);
  });

  it("frequency_exactly_at_the_edge_passes", () => {
    // 400 000 Hz target, ±2.5 %: the upper edge is 410 000 Hz exactly (2.5 % of 400 000 = 10 000).
    const r = evaluateSpec({ targetHz: 400_000, toleranceValue: 2.5, toleranceUnit: "percent" }, measured({ frequencyHz: 410_000 }));
    expect(r.checks[0].passed).toBe(true);
    expect(r.checks[0].margin).toBeCloseTo(0, 12);
  });

  it("frequency_below_target_reads_negative_deviation", () => {
    // (99 000 − 100 000) / 100 000 = −1 %
    const r = evaluateSpec({ targetHz: 100_000, toleranceValue: 0.5, toleranceUnit: "percent" }, measured({ frequencyHz: 99_000 }));
    expect(r.checks[0].measured).toBeCloseTo(-1, 12);
    expect(r.checks[0].margin).toBeCloseTo(-0.5, 12);
    expect(r.verdict).toBe("fail");
  });

  it("thd_over_the_limit_fails_by_the_difference", () => {
    // 1.2 % measured against 1 %: margin = 1 − 1.2 = −0.2 %
    const r = evaluateSpec({ maxThdPercent: 1 }, measured());
    expect(r.checks).toHaveLength(1);
    expect(r.checks[0]).toMatchObject({ rule: "thd", passed: false, measured: 1.2, limit: 1, unit: "%" });
    expect(r.checks[0].margin).toBeCloseTo(-0.2, 12);
  });

  it("thd_equal_to_the_limit_passes", () => {
    const r = evaluateSpec({ maxThdPercent: 1.2 }, measured());
    expect(r.checks[0].passed).toBe(true);
    expect(r.verdict).toBe("pass");
  });

  it("thd_unmeasurable_fails_when_limited", () => {
    const r = evaluateSpec({ maxThdPercent: 5 }, measured({ thdPercent: null }));
    expect(r.checks[0]).toMatchObject({ rule: "thd", passed: false, measured: null, margin: null });
  });

  it("each_harmonic_is_its_own_check", () => {
    // limit −40 dBc: H2 at −38.5 → margin −40 − (−38.5) = −1.5 dB (fail); H3 at −45 → margin +5 dB (pass)
    const r = evaluateSpec({ maxHarmonicDbc: -40 }, measured());
    expect(r.checks.map((c) => c.rule)).toEqual(["harmonic-2", "harmonic-3"]);
    expect(r.checks[0].passed).toBe(false);
    expect(r.checks[0].margin).toBeCloseTo(-1.5, 12);
    expect(r.checks[1].passed).toBe(true);
    expect(r.checks[1].margin).toBeCloseTo(5, 12);
    expect(r.verdict).toBe("fail");
  });

  it("harmonics_without_a_level_are_skipped", () => {
    const r = evaluateSpec({ maxHarmonicDbc: -40 }, measured({ harmonics: [{ order: 2, dBc: null }, { order: 3, dBc: -50 }] }));
    expect(r.checks.map((c) => c.rule)).toEqual(["harmonic-3"]);
  });

  it("amplitude_below_minimum_fails", () => {
    // 1.5 V against 2 V minimum: margin = 1.5 − 2 = −0.5 V
    const r = evaluateSpec({ minFundamentalVpk: 2 }, measured());
    expect(r.checks[0]).toMatchObject({ rule: "amplitude", passed: false, unit: "V" });
    expect(r.checks[0].margin).toBeCloseTo(-0.5, 12);
    expect(r.checks[0].message).toMatch(/below by 500\.? ?mV/);
  });

  it("in_record_drift_uses_its_magnitude", () => {
    // −30 ppm against 20 ppm: margin = 20 − 30 = −10 ppm
    const r = evaluateSpec({ maxDriftPpm: 20 }, measured({ inRecordDriftPpm: -30 }));
    expect(r.checks[0]).toMatchObject({ rule: "in-record-drift", passed: false, measured: -30 });
    expect(r.checks[0].margin).toBeCloseTo(-10, 12);
  });

  it("in_record_drift_without_a_number_falls_back_to_the_warning", () => {
    const quiet = evaluateSpec({ maxDriftPpm: 20 }, measured({ inRecordDriftPpm: null }));
    expect(quiet.checks[0].passed).toBe(true);
    const drifting = evaluateSpec(
      { maxDriftPpm: 20 },
      measured({ inRecordDriftPpm: null, warnings: [{ code: "in-record-drift", message: "The first and last thirds differ." }] }),
    );
    expect(drifting.checks[0].passed).toBe(false);
  });

  it("clipping_fails_a_run_whose_numbers_pass", () => {
    const r = evaluateSpec(
      { maxThdPercent: 5 },
      measured({ warnings: [{ code: "clipping", message: "The waveform is flat at its extremes." }] }),
    );
    expect(r.checks.map((c) => [c.rule, c.passed])).toEqual([
      ["thd", true],
      ["warning-clipping", false],
    ]);
    expect(r.verdict).toBe("fail");
  });

  it("not_steady_fails_even_without_a_spec", () => {
    const r = evaluateSpec({}, measured({ warnings: [{ code: "not-steady", message: "The amplitude grows 40 % across the record." }] }));
    expect(r.verdict).toBe("fail");
    expect(r.checks[0].message).toMatch(/cannot pass/);
  });

  it("other_warnings_do_not_fail_the_run", () => {
    const r = evaluateSpec({ maxThdPercent: 5 }, measured({ warnings: [{ code: "few-cycles", message: "Only 6 periods." }] }));
    expect(r.verdict).toBe("pass");
  });

  it("empty_spec_and_clean_capture_gives_no_verdict", () => {
    expect(evaluateSpec({}, measured())).toEqual({ verdict: null, checks: [] });
  });

  it("target_without_tolerance_is_not_checked", () => {
    expect(evaluateSpec({ targetHz: 1e6 }, measured()).checks).toEqual([]);
  });

  it("non_positive_target_throws", () => {
    expect(() => evaluateSpec({ targetHz: 0, toleranceValue: 1 }, measured())).toThrow(/targetHz must be above 0 Hz; got 0/);
  });

  it("checks_come_in_fixed_order", () => {
    const r = evaluateSpec(
      { targetHz: 390_000, toleranceValue: 1, toleranceUnit: "percent", maxThdPercent: 2, maxHarmonicDbc: -30, minFundamentalVpk: 1, maxDriftPpm: 50 },
      measured(),
    );
    expect(r.checks.map((c) => c.rule)).toEqual(["frequency", "thd", "harmonic-2", "harmonic-3", "amplitude", "in-record-drift"]);
    expect(r.verdict).toBe("pass");
  });
});

describe("hasAnyLimit", () => {
  it("empty_spec_has_none", () => expect(hasAnyLimit({})).toBe(false));
  it("target_alone_is_not_a_limit", () => expect(hasAnyLimit({ targetHz: 1e6 })).toBe(false));
  it("a_thd_limit_counts", () => expect(hasAnyLimit({ maxThdPercent: 1 })).toBe(true));
  it("target_with_tolerance_counts", () => expect(hasAnyLimit({ targetHz: 1e6, toleranceValue: 100, toleranceUnit: "ppm" })).toBe(true));
});
