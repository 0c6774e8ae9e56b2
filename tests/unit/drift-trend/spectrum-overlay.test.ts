import { describe, expect, it } from "vitest";
import { alignSpectra } from "@/lib/drift-trend/spectrum-overlay";

describe("alignSpectra", () => {
  it("shared_frequencies_appear_once_with_both_levels", () => {
    const s = alignSpectra({ frequencyHz: [0, 10, 20], levels: [-90, -10, -50] }, { frequencyHz: [0, 10, 20], levels: [-91, -12, -48] });
    expect(s).toEqual({ frequencyHz: [0, 10, 20], a: [-90, -10, -50], b: [-91, -12, -48] });
  });

  it("different_bins_interleave_with_nulls", () => {
    const s = alignSpectra({ frequencyHz: [0, 10, 20], levels: [1, 2, 3] }, { frequencyHz: [5, 10, 25], levels: [4, 5, 6] });
    expect(s.frequencyHz).toEqual([0, 5, 10, 20, 25]);
    expect(s.a).toEqual([1, null, 2, 3, null]);
    expect(s.b).toEqual([null, 4, 5, null, 6]);
  });

  it("an_empty_spectrum_gives_the_other_alone", () => {
    const s = alignSpectra({ frequencyHz: [], levels: [] }, { frequencyHz: [1, 2], levels: [7, 8] });
    expect(s).toEqual({ frequencyHz: [1, 2], a: [null, null], b: [7, 8] });
  });

  it("mismatched_lengths_are_a_range_error", () => {
    expect(() => alignSpectra({ frequencyHz: [1, 2], levels: [1] }, { frequencyHz: [], levels: [] })).toThrow(/spectrum A needs one level per frequency; got 2 frequencies and 1 levels/);
  });

  it("falling_frequencies_are_a_range_error", () => {
    expect(() => alignSpectra({ frequencyHz: [], levels: [] }, { frequencyHz: [2, 1], levels: [0, 0] })).toThrow(/spectrum B frequencies must rise strictly; got 2 then 1 Hz at index 1/);
  });
});
