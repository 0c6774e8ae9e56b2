import { describe, expect, it } from "vitest";
import { POINTS_PER_RUN, buildTimelineSeries, runPositionAt, toleranceBandHz, type TimelineRunInput, type TimelineTweakInput } from "@/lib/drift-trend/timeline";

const day = (d: number, h = 9) => new Date(Date.UTC(2026, 10, d, h, 0, 0));

function run(id: string, at: Date, over: Partial<TimelineRunInput> = {}): TimelineRunInput {
  return {
    id,
    createdAt: at,
    originalFilename: `${id}.csv`,
    measuredHz: 390_000,
    frequencyUncertaintyHz: 0.5,
    predictedHz: 369_000,
    worstCase: { minHz: 340_000, maxHz: 400_000 },
    statistical: { minHz: 355_000, maxHz: 383_000 },
    spec: { targetHz: 370_000, toleranceValue: 2, toleranceUnit: "percent", maxThdPercent: 5, maxHarmonicDbc: -30 },
    thdPercent: 1.7,
    worstHarmonicDbc: -36,
    verdict: "fail",
    ...over,
  };
}

function tweak(id: string, at: Date, partRef: string | null, planned = false): TimelineTweakInput {
  return { id, createdAt: at, partRef, planned, text: partRef ? `${partRef} change` : "note" };
}

describe("toleranceBandHz", () => {
  it("percent_tolerance_around_the_target", () => {
    // 370 kHz ± 2 % = 362.6 – 377.4 kHz (hand-computed).
    const band = toleranceBandHz({ targetHz: 370_000, toleranceValue: 2, toleranceUnit: "percent" })!;
    expect(band.minHz).toBeCloseTo(362_600, 6);
    expect(band.maxHz).toBeCloseTo(377_400, 6);
  });
  it("ppm_tolerance_around_the_target", () => {
    // 3.58 MHz ± 5000 ppm = 3.5621 – 3.5979 MHz.
    const band = toleranceBandHz({ targetHz: 3.58e6, toleranceValue: 5000, toleranceUnit: "ppm" })!;
    expect(band.minHz).toBeCloseTo(3_562_100, 4);
    expect(band.maxHz).toBeCloseTo(3_597_900, 4);
  });
  it("no_target_or_no_tolerance_is_null", () => {
    expect(toleranceBandHz({ toleranceValue: 1 })).toBeNull();
    expect(toleranceBandHz({ targetHz: 1e6 })).toBeNull();
    expect(toleranceBandHz(null)).toBeNull();
  });
});

describe("runPositionAt", () => {
  it("three_points_per_run", () => {
    expect(POINTS_PER_RUN).toBe(3);
    expect([0, 1, 2, 3, 5, 6].map(runPositionAt)).toEqual([0, 0, 0, 1, 1, 2]);
  });
});

describe("buildTimelineSeries", () => {
  it("runs_are_sorted_by_upload_time_and_numbered_from_one", () => {
    const s = buildTimelineSeries([run("b", day(3)), run("a", day(2))], []);
    expect(s.runs.map((r) => [r.id, r.index])).toEqual([
      ["a", 1],
      ["b", 2],
    ]);
    expect(s.x).toEqual([0.5, 1, 1.5, 1.5, 2, 2.5]);
  });

  it("measured_values_sit_only_at_the_run_with_their_uncertainty", () => {
    const s = buildTimelineSeries([run("a", day(2), { measuredHz: 1000, frequencyUncertaintyHz: 2 })], []);
    expect(s.measuredHz).toEqual([null, 1000, null]);
    expect(s.measuredLowHz).toEqual([null, 998, null]);
    expect(s.measuredHighHz).toEqual([null, 1002, null]);
  });

  it("no_uncertainty_leaves_the_error_bar_out", () => {
    const s = buildTimelineSeries([run("a", day(2), { frequencyUncertaintyHz: null })], []);
    expect(s.measuredLowHz).toEqual([null, null, null]);
  });

  it("the_prediction_is_flat_across_a_run_and_steps_halfway_to_the_next", () => {
    const s = buildTimelineSeries([run("a", day(2), { predictedHz: 369_000 }), run("b", day(4), { predictedHz: 363_000 })], [tweak("t", day(3), "C2")]);
    expect(s.predictedHz).toEqual([369_000, 369_000, 369_000, 363_000, 363_000, 363_000]);
    // The step is the vertical between two points at the same x (1.5).
    expect(s.x[2]).toBe(s.x[3]);
  });

  it("tweaks_between_runs_make_one_marker_and_a_new_segment", () => {
    const s = buildTimelineSeries(
      [run("a", day(2)), run("b", day(4)), run("c", day(6))],
      [tweak("t1", day(3), null), tweak("t2", day(3, 10), "C2"), tweak("t3", day(5), null)],
    );
    expect(s.markers.map((m) => ({ x: m.x, n: m.number, ids: m.tweaks.map((t) => t.id), part: m.changesPart }))).toEqual([
      { x: 1.5, n: 1, ids: ["t1", "t2"], part: true },
      { x: 2.5, n: 2, ids: ["t3"], part: false },
    ]);
    expect(s.runs.map((r) => r.segment)).toEqual([0, 1, 2]);
  });

  it("planned_tweaks_are_left_out", () => {
    const s = buildTimelineSeries([run("a", day(2)), run("b", day(4))], [tweak("p", day(3), "C2", true)]);
    expect(s.markers).toEqual([]);
    expect(s.runs.map((r) => r.segment)).toEqual([0, 0]);
  });

  it("a_tweak_before_the_first_run_is_a_marker_but_not_a_new_segment", () => {
    const s = buildTimelineSeries([run("a", day(2))], [tweak("t", day(1), "C1")]);
    expect(s.markers[0].x).toBe(0.5);
    expect(s.runs[0].segment).toBe(0);
  });

  it("a_tweak_after_the_last_run_waits_at_the_right_edge", () => {
    const s = buildTimelineSeries([run("a", day(2))], [tweak("t", day(3), "C1")]);
    expect(s.markers[0].x).toBe(1.5);
  });

  it("a_run_logged_at_the_same_moment_as_a_tweak_follows_it", () => {
    const s = buildTimelineSeries([run("a", day(2)), run("b", day(3))], [tweak("t", day(3), "C2")]);
    expect(s.markers[0].x).toBe(1.5);
    expect(s.runs[1].segment).toBe(1);
  });

  it("spec_lines_follow_each_runs_snapshot", () => {
    const s = buildTimelineSeries([run("a", day(2)), run("b", day(3), { spec: { targetHz: 371_000, maxHarmonicDbc: -40 } })], []);
    expect(s.targetHz).toEqual([370_000, 370_000, 370_000, 371_000, 371_000, 371_000]);
    expect(s.toleranceLowHz.slice(3)).toEqual([null, null, null]);
    expect(s.maxHarmonicDbc).toEqual([-30, -30, -30, -40, -40, -40]);
    expect(s.maxThdPercent.slice(3)).toEqual([null, null, null]);
  });

  it("an_unreadable_date_is_a_range_error", () => {
    expect(() => buildTimelineSeries([run("a", "not a date" as unknown as Date)], [])).toThrow(/createdAt must be a valid date; got not a date/);
  });
});
