import { describe, expect, it } from "vitest";
import { axisTickLabels, axisUnit } from "@/lib/format/axis";
import { MINUS } from "@/lib/format/numbers";

describe("axisUnit", () => {
  it("millivolts_for_small_voltages", () => {
    expect(axisUnit(2.3e-3, "V")).toEqual({ factor: 1000, unit: "mV" });
  });
  it("kilohertz_for_a_spectrum", () => {
    expect(axisUnit(412e3, "Hz")).toEqual({ factor: 0.001, unit: "kHz" });
  });
  it("microseconds_for_a_short_record", () => {
    const a = axisUnit(200e-6, "s");
    expect(a.unit).toBe("µs");
    expect(a.factor).toBeCloseTo(1e6, 6);
  });
  it("zero_range_keeps_the_base_unit", () => {
    expect(axisUnit(0, "V")).toEqual({ factor: 1, unit: "V" });
  });
});

describe("axisTickLabels", () => {
  it("whole_numbers_when_ticks_are_whole", () => {
    expect(axisTickLabels([0, 50e-6, 100e-6], 50e-6, { factor: 1e6, unit: "µs" })).toEqual(["0", "50", "100"]);
  });
  it("a_2_5_step_keeps_its_decimal", () => {
    expect(axisTickLabels([0, 2.5e6, 5e6, 7.5e6], 2.5e6, { factor: 1e-6, unit: "MHz" })).toEqual(["0.0", "2.5", "5.0", "7.5"]);
  });
  it("a_0_02_step_has_two_decimals", () => {
    expect(axisTickLabels([0.02, 0.04], 0.02, { factor: 1, unit: "V" })).toEqual(["0.02", "0.04"]);
  });
  it("a_deep_zoom_far_from_zero_gives_ticks_that_differ", () => {
    // 45.778626 ms into the record, ticks 0.2 ns apart: six decimals wrote every tick as "45.778626".
    const ms = { factor: 1e3, unit: "ms" };
    const splits = [0, 1, 2, 3, 4].map((k) => 45.7786261e-3 + k * 0.2e-9);
    const labels = axisTickLabels(splits, 0.2e-9, ms);
    expect(labels).toEqual(["45.7786261", "45.7786263", "45.7786265", "45.7786267", "45.7786269"]);
  });
  it("ticks_that_round_alike_at_the_step_s_decimals_get_more", () => {
    // A step that is exact at 1 decimal but ticks offset by 0.04: 1.04 and 1.14 would not collide, 1.04 and 1.06 would.
    const labels = axisTickLabels([1.04, 1.06, 1.08], 0.1, { factor: 1, unit: "V" });
    expect(new Set(labels).size).toBe(3);
  });
  it("decimals_follow_the_step_and_minus_is_u2212", () => {
    expect(axisTickLabels([-0.5, 0, 0.5], 0.5, { factor: 1, unit: "V" })).toEqual([`${MINUS}0.5`, "0.0", "0.5"]);
  });
});
