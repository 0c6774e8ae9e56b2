import { describe, expect, it } from "vitest";
import { evaluateSpec } from "@/lib/spec/evaluate";
import {
  EMISSIONS_SAFETY_NOTE,
  SPEC_PRESETS,
  applySpecPreset,
  getSpecPreset,
  matchingPresetIds,
} from "@/lib/spec/presets";
import type { SpecMeasurements } from "@/lib/spec/types";

function measurementsWithHarmonic(dBc: number): SpecMeasurements {
  return {
    frequencyHz: 1_000_000,
    thdPercent: 1,
    harmonics: [{ order: 2, dBc }],
    fundamentalVpk: 1,
    inRecordDriftPpm: null,
    warnings: [],
  };
}

describe("SPEC_PRESETS", () => {
  it("every_preset_is_marked_as_an_example_with_its_basis_and_limit_kind", () => {
    for (const preset of SPEC_PRESETS) {
      expect(preset.example).toBe(true);
      expect(["law", "practice"]).toContain(preset.basis);
      expect(preset.basisNote.length).toBeGreaterThan(0);
      expect(["per-harmonic-dbc", "thd-percent", "frequency-tolerance", "rms-jitter-s", "phase-noise-dbc-hz", "start-up-s", "pushing-ppm-per-v", "tempco-ppm-per-k"]).toContain(preset.limitKind);
    }
  });

  it("ids_are_unique_and_kebab_case", () => {
    const ids = SPEC_PRESETS.map((p) => p.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids) expect(id).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
  });

  it("harmonic_ladder_matches_the_reference_sheet", () => {
    const ladder = Object.fromEntries(SPEC_PRESETS.filter((p) => p.limitKind === "per-harmonic-dbc").map((p) => [p.id, [p.spec.maxHarmonicDbc, p.basis]]));
    expect(ladder).toEqual({
      "raw-lc-unfiltered": [-20, "practice"], // REFERENCES.md §6 suggested ladder: "raw LC, unfiltered" −20 dBc [practice]
      bench: [-30, "practice"], // REFERENCES.md §6: "bench" −30 dBc [practice]; a generator manual's −30 dBc below 100 MHz
      clean: [-40, "practice"], // REFERENCES.md §6: "clean" −40 dBc [practice]
      "us-amateur-hf-post-2003": [-43, "law"], // REFERENCES.md §6: 47 CFR §97.307(d), ≥ 43 dB below, installed after 1 Jan 2003
      "us-amateur-vhf-over-25w": [-60, "law"], // REFERENCES.md §6: 47 CFR §97.307(e), 30–225 MHz, ≥ 60 dB below
    });
  });

  it("law_presets_cite_their_section_and_where_to_read_it", () => {
    const law = SPEC_PRESETS.filter((p) => p.basis === "law");
    expect(law.map((p) => p.basisNote)).toEqual(["47 CFR §97.307(d)", "47 CFR §97.307(e)"]); // REFERENCES.md §6
    for (const p of law) {
      expect(p.sourceUrl).toMatch(/^https:\/\/www\.ecfr\.gov\/.*section-97\.307$/);
      expect(p.scope).toBeTruthy();
    }
  });

  it("practice_presets_say_common_practice_and_carry_no_law_url", () => {
    for (const p of SPEC_PRESETS.filter((x) => x.basis === "practice")) {
      expect(p.basisNote).toMatch(/common practice/);
      expect(p.sourceUrl).toBeUndefined();
    }
  });

  it("frequency_preset_is_half_a_percent_and_leaves_the_target_alone", () => {
    const p = getSpecPreset("frequency-half-percent");
    expect(p.limitKind).toBe("frequency-tolerance");
    expect(p.spec).toEqual({ toleranceValue: 0.5, toleranceUnit: "percent" }); // issue 7: "frequency within ±0.5%"
    expect("targetHz" in p.spec).toBe(false);
  });

  it("harmonic_presets_set_only_the_per_harmonic_limit", () => {
    for (const p of SPEC_PRESETS.filter((x) => x.limitKind === "per-harmonic-dbc")) {
      expect(Object.keys(p.spec)).toEqual(["maxHarmonicDbc"]);
      expect(p.spec.maxHarmonicDbc).toBeLessThan(0);
    }
  });
});

describe("EMISSIONS_SAFETY_NOTE", () => {
  it("says_presets_are_examples_and_local_rules_govern_radiated_emissions", () => {
    expect(EMISSIONS_SAFETY_NOTE).toMatch(/examples/);
    expect(EMISSIONS_SAFETY_NOTE).toMatch(/Local regulations and codes govern radiated emission limits/);
    expect(EMISSIONS_SAFETY_NOTE).toMatch(/licensing/);
    expect(EMISSIONS_SAFETY_NOTE).toMatch(/mains-powered/);
  });
});

describe("getSpecPreset", () => {
  it("returns_the_preset_by_id", () => {
    expect(getSpecPreset("clean").summary).toBe("harmonics at least 40 dB below the fundamental"); // issue 7 wording
  });

  it("unknown_id_throws_range_error_naming_the_value", () => {
    expect(() => getSpecPreset("fcc-everything")).toThrow(RangeError);
    expect(() => getSpecPreset("fcc-everything")).toThrow(/spec preset must be one of .*clean.*; got "fcc-everything"/);
  });
});

describe("applySpecPreset", () => {
  it("keeps_target_and_other_limits_and_replaces_the_preset_fields", () => {
    const spec = { targetHz: 7_040_000, toleranceValue: 100, toleranceUnit: "ppm" as const, maxHarmonicDbc: -25, maxThdPercent: 5 };
    const out = applySpecPreset(spec, "us-amateur-hf-post-2003");
    expect(out).toEqual({ ...spec, maxHarmonicDbc: -43 });
    expect(spec.maxHarmonicDbc).toBe(-25); // the input is not changed
  });

  it("frequency_preset_replaces_a_ppm_tolerance_with_percent", () => {
    const out = applySpecPreset({ targetHz: 455_000, toleranceValue: 100, toleranceUnit: "ppm" }, "frequency-half-percent");
    expect(out).toEqual({ targetHz: 455_000, toleranceValue: 0.5, toleranceUnit: "percent" });
  });

  it("clean_preset_passes_a_harmonic_exactly_at_minus_40_and_fails_just_above", () => {
    // Limits are inclusive (lib/spec/evaluate): −40.0 dBc against −40 dBc has margin 0; −39.9 dBc is 0.1 dB outside.
    const spec = applySpecPreset({}, "clean");
    expect(evaluateSpec(spec, measurementsWithHarmonic(-40)).verdict).toBe("pass");
    const fail = evaluateSpec(spec, measurementsWithHarmonic(-39.9));
    expect(fail.verdict).toBe("fail");
    expect(fail.checks[0].margin).toBeCloseTo(-0.1, 9);
  });

  it("unknown_id_throws_range_error", () => {
    expect(() => applySpecPreset({}, "")).toThrow(RangeError);
  });
});

describe("matchingPresetIds", () => {
  it("finds_the_harmonic_and_frequency_presets_a_spec_equals", () => {
    expect(matchingPresetIds({ targetHz: 1e6, toleranceValue: 0.5, toleranceUnit: "percent", maxHarmonicDbc: -40 })).toEqual([
      "clean",
      "frequency-half-percent",
    ]);
  });

  it("adapted_values_match_no_preset", () => {
    expect(matchingPresetIds({ maxHarmonicDbc: -41, toleranceValue: 0.5, toleranceUnit: "ppm" })).toEqual([]);
  });
});
