import { describe, expect, it } from "vitest";
import {
  DASH,
  MINUS,
  formatDecibels,
  formatDrift,
  formatDriftLeading,
  formatPartValue,
  formatPercent,
  formatPpm,
  formatQuantity,
  formatSignedCapacitance,
  formatSignedPicofarads,
  formatRange,
  formatThd,
  formatWithUncertainty,
  typographicMinus,
} from "@/lib/format/numbers";

describe("typographicMinus", () => {
  it("leading_and_exponent_minus_become_u2212", () => {
    expect(typographicMinus("-1.00e-18 F")).toBe(`${MINUS}1.00e${MINUS}18 F`);
  });
  it("hyphens_inside_words_stay", () => {
    expect(typographicMinus("not-steady")).toBe("not-steady");
  });
});

describe("formatQuantity", () => {
  it("frequency_in_kilohertz", () => {
    expect(formatQuantity(412307, "Hz", 6)).toBe("412.307 kHz");
  });
  it("negative_voltage_uses_the_typographic_minus", () => {
    expect(formatQuantity(-0.0123, "V", 3)).toBe(`${MINUS}12.3 mV`);
  });
  it("signed_positive_gets_a_plus", () => {
    expect(formatQuantity(1500, "Hz", 2, { signed: true })).toBe("+1.5 kHz");
  });
  it("missing_values_show_a_dash", () => {
    expect(formatQuantity(null, "Hz")).toBe(DASH);
    expect(formatQuantity(Number.NaN, "Hz")).toBe(DASH);
  });
  it("bad_figures_throw_range_error", () => {
    expect(() => formatQuantity(1, "Hz", 0)).toThrow(RangeError);
  });
});

describe("formatPartValue", () => {
  it("capacitor_trims_trailing_zeros", () => {
    expect(formatPartValue(4.7e-9, "F")).toBe("4.7 nF");
  });
  it("inductor_in_microhenries", () => {
    expect(formatPartValue(1e-5, "H")).toBe("10 µH");
  });
});

describe("formatWithUncertainty", () => {
  it("value_rounded_to_the_uncertainty_digit", () => {
    expect(formatWithUncertainty(412307.123, 0.83, "Hz")).toEqual({
      value: "412.3071 kHz",
      uncertainty: "± 0.8 Hz",
      text: "412.3071 kHz ± 0.8 Hz",
    });
  });
  it("leading_one_keeps_two_figures", () => {
    // common practice: 0.14 shown as 0.1 would understate it by 30 %
    expect(formatWithUncertainty(412307.123, 0.14, "Hz").uncertainty).toBe("± 0.14 Hz");
    expect(formatWithUncertainty(412307.123, 0.14, "Hz").value).toBe("412.30712 kHz");
  });
  it("large_uncertainty_limits_the_value_figures", () => {
    expect(formatWithUncertainty(1.5e6, 2500, "Hz").text).toBe("1.500 MHz ± 3 kHz");
  });
  it("uncertainty_bigger_than_value_still_prints", () => {
    expect(formatWithUncertainty(3, 50, "Hz").text).toBe("3 Hz ± 50 Hz");
  });
  it("no_uncertainty_falls_back_to_fixed_figures", () => {
    expect(formatWithUncertainty(412307.123, null, "Hz")).toEqual({ value: "412.307 kHz", uncertainty: "", text: "412.307 kHz" });
  });
  it("missing_value_is_a_dash", () => {
    expect(formatWithUncertainty(undefined, 1, "Hz").text).toBe(DASH);
  });
});

describe("formatDecibels", () => {
  it("dbc_with_one_decimal_and_u2212", () => {
    expect(formatDecibels(-38.24, "dBc")).toBe(`${MINUS}38.2 dBc`);
  });
  it("rounding_to_zero_drops_the_sign", () => {
    expect(formatDecibels(-0.04, "dBV")).toBe("0.0 dBV");
  });
});

describe("formatPpm", () => {
  it("large_values_whole_ppm", () => {
    expect(formatPpm(1234.5)).toBe("+1235 ppm");
  });
  it("small_values_one_decimal", () => {
    expect(formatPpm(-12.34)).toBe(`${MINUS}12.3 ppm`);
  });
  it("zero_is_unsigned", () => {
    expect(formatPpm(0)).toBe("0 ppm");
  });
  it("never_finer_than_a_tenth", () => {
    expect(formatPpm(-0.04)).toBe("0.0 ppm");
  });
});

describe("formatPercent", () => {
  it("three_significant_figures", () => {
    expect(formatPercent(0.12345)).toBe("0.123 %");
  });
  it("signed_negative", () => {
    expect(formatPercent(-2.5, 3, { signed: true })).toBe(`${MINUS}2.50 %`);
  });
});

describe("formatDrift", () => {
  it("ppm_and_percent_agree", () => {
    expect(formatDrift(-1520)).toEqual({ ppm: `${MINUS}1520 ppm`, percent: `${MINUS}0.152 %` });
  });
  it("missing_is_dashes", () => {
    expect(formatDrift(null)).toEqual({ ppm: DASH, percent: DASH });
  });
});

describe("formatDriftLeading", () => {
  it("below_one_percent_leads_with_ppm", () => {
    expect(formatDriftLeading(-1520)).toEqual({ main: `${MINUS}1520 ppm`, detail: `${MINUS}0.152 %` });
  });
  it("from_one_percent_leads_with_percent", () => {
    expect(formatDriftLeading(-10_000)).toEqual({ main: `${MINUS}1.00 %`, detail: `${MINUS}10000 ppm` });
  });
  it("missing_is_dashes", () => {
    expect(formatDriftLeading(undefined)).toEqual({ main: DASH, detail: DASH });
  });
});

describe("formatSignedPicofarads", () => {
  it("positive_has_plus", () => {
    expect(formatSignedPicofarads(3.24e-12)).toBe("+3.2 pF");
  });
  it("negative_has_u2212", () => {
    expect(formatSignedPicofarads(-1.4e-12)).toBe(`${MINUS}1.4 pF`);
  });
});

describe("formatThd", () => {
  it("ratio_to_percent_and_db", () => {
    // 20·log10(0.0123) = −38.20 dB
    expect(formatThd(0.0123)).toEqual({ percent: "1.23 %", db: `${MINUS}38.2 dB` });
  });
  it("zero_thd_has_no_db_value", () => {
    expect(formatThd(0).db).toBe(DASH);
  });
});

describe("formatRange", () => {
  it("shared_prefix_writes_the_unit_once", () => {
    expect(formatRange(1.131e6, 1.219e6, "Hz", 5)).toBe("1.1310 – 1.2190 MHz");
  });
  it("different_prefixes_keep_both_units", () => {
    expect(formatRange(998e3, 1.02e6, "Hz", 5)).toBe("998.00 kHz – 1.0200 MHz");
  });
  it("missing_end_is_a_dash", () => {
    expect(formatRange(null, 1, "Hz")).toBe(DASH);
  });
});

describe("formatSignedCapacitance", () => {
  it("small_values_in_picofarads", () => {
    expect(formatSignedCapacitance(3.244e-12)).toBe("+3.24 pF");
  });
  it("large_values_in_engineering_notation", () => {
    expect(formatSignedCapacitance(-4.7279e-9)).toBe(`${MINUS}4.728 nF`);
  });
});
