import { describe, expect, it } from "vitest";
import { absoluteUncertaintyHz } from "@/lib/drift-trend/absolute-uncertainty";

describe("absoluteUncertaintyHz", () => {
  it("root-sum-squares the statistical 1σ with the timebase: 1 MHz, ±3 Hz statistical, ±4 ppm (= ±4 Hz) gives ±5 Hz", () => {
    expect(absoluteUncertaintyHz(1e6, 3, 4)).toBeCloseTo(5, 12);
  });

  it("is the statistical figure when the timebase is unknown or zero, and null when a figure is missing", () => {
    expect(absoluteUncertaintyHz(1e6, 3, null)).toBe(3);
    expect(absoluteUncertaintyHz(1e6, 3, 0)).toBe(3);
    expect(absoluteUncertaintyHz(null, 3, 4)).toBeNull();
    expect(absoluteUncertaintyHz(1e6, null, 4)).toBeNull();
  });
});
