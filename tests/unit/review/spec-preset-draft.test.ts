import { describe, expect, it } from "vitest";
import { applyPresetToText, specOfText, type SpecTextFields } from "@/components/review/spec-preset-draft";
import { flagFigure, ruleName } from "@/components/review/rule-name";
import { MINUS } from "@/lib/format/numbers";
import { matchingPresetIds } from "@/lib/spec/presets";

const typed: SpecTextFields = {
  targetHz: "412.3k",
  toleranceValue: "1",
  toleranceUnit: "ppm",
  maxThdPercent: "2",
  maxHarmonicDbc: "",
  minFundamentalVpk: "0.5",
  maxDriftPpm: "",
};

describe("specOfText", () => {
  it("plain_numbers_parse_and_blanks_are_null", () => {
    expect(specOfText(typed)).toEqual({ toleranceValue: 1, toleranceUnit: "ppm", maxThdPercent: 2, maxHarmonicDbc: null, minFundamentalVpk: 0.5, maxDriftPpm: null });
  });
  it("the_typographic_minus_reads_as_a_minus", () => {
    expect(specOfText({ ...typed, maxHarmonicDbc: `${MINUS}40` }).maxHarmonicDbc).toBe(-40);
  });
  it("text_that_is_not_a_number_is_null", () => {
    expect(specOfText({ ...typed, maxThdPercent: "2 %" }).maxThdPercent).toBeNull();
  });
});

describe("applyPresetToText", () => {
  it("a_harmonic_preset_writes_only_its_field", () => {
    const next = applyPresetToText(typed, "clean");
    expect(next).toEqual({ ...typed, maxHarmonicDbc: "-40" });
    expect(matchingPresetIds(specOfText(next))).toContain("clean");
  });
  it("the_frequency_preset_sets_value_and_unit_and_keeps_the_target", () => {
    const next = applyPresetToText(typed, "frequency-half-percent");
    expect(next.toleranceValue).toBe("0.5");
    expect(next.toleranceUnit).toBe("percent");
    expect(next.targetHz).toBe("412.3k");
  });
  it("the_input_is_not_changed", () => {
    const copy = { ...typed };
    applyPresetToText(typed, "bench");
    expect(typed).toEqual(copy);
  });
  it("an_unknown_preset_is_a_range_error", () => {
    expect(() => applyPresetToText(typed, "no-such")).toThrow(RangeError);
  });
});

describe("ruleName", () => {
  it("names_each_kind_of_rule", () => {
    expect(ruleName("thd")).toBe("THD");
    expect(ruleName("harmonic-3")).toBe("Harmonic 3");
    expect(ruleName("warning-not-steady")).toBe("Trust: not steady");
    expect(ruleName("in-record-drift")).toBe("Drift within the record");
  });
});

describe("flagFigure", () => {
  it("a_dbc_margin_is_signed_decibels", () => {
    expect(flagFigure(-4.5, "dBc", true)).toBe(`${MINUS}4.5 dB`);
    expect(flagFigure(-35, "dBc")).toBe(`${MINUS}35.0 dBc`);
  });
  it("percent_with_two_decimals_and_missing_as_a_dash", () => {
    expect(flagFigure(1.234, "%")).toBe("1.23 %");
    expect(flagFigure(null, "%")).toBe("\u2014");
  });
  it("a_value_that_rounds_to_zero_has_no_minus", () => {
    expect(flagFigure(-0.001, "%")).toBe("0.00 %");
  });
});
