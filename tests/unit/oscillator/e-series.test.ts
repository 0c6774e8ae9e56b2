import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  eSeriesMantissas,
  isPreferred,
  nearestPreferred,
  nextAbove,
  nextBelow,
  preferredValuesBetween,
  type ESeriesName,
} from "@/lib/oscillator";

const SERIES: ESeriesName[] = ["E6", "E12", "E24", "E48", "E96"];

describe("eSeriesMantissas", () => {
  it("lists E12 as IEC 60063", () => {
    // REFERENCES.md §5: IEC 60063 E12 (Wikipedia "E-series of preferred numbers"; qsl.net/g4usp).
    expect(eSeriesMantissas("E12")).toEqual([1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2]);
  });

  it("lists E24 as IEC 60063, 4.3 and not 4.2", () => {
    // REFERENCES.md §5: IEC 60063 E24; one web copy (statemaster.com) prints 4.2 for 4.3.
    expect(eSeriesMantissas("E24")).toEqual([
      1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2,
      9.1,
    ]);
  });

  it("lists E6 as every second E12 value", () => {
    // E6 from memory (IEC 60063); that it is every second E12 value is derived.
    expect(eSeriesMantissas("E6")).toEqual([1.0, 1.5, 2.2, 3.3, 4.7, 6.8]);
    expect(eSeriesMantissas("E12").filter((_, i) => i % 2 === 0)).toEqual(eSeriesMantissas("E6"));
  });

  it("has E12 as every second E24 value", () => {
    // REFERENCES.md §5 [computed]: E12 = every second E24 value.
    expect(eSeriesMantissas("E24").filter((_, i) => i % 2 === 0)).toEqual(eSeriesMantissas("E12"));
  });

  it("differs from round(10^(i/24), 1) exactly where IEC 60063 rounds by hand", () => {
    // REFERENCES.md §5 trap [computed]: 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2.
    const differing = eSeriesMantissas("E24").filter((m, i) => Math.round(10 ** (i / 24) * 10) / 10 !== m);
    expect(differing).toEqual([2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2]);
  });

  it("has E96 equal to round(10^(i/96), 2) and E48 as every second E96 value", () => {
    // E48/E96 tables from memory of IEC 60063; cross-checked here against the defining formula [computed].
    const e96 = eSeriesMantissas("E96");
    expect(e96).toHaveLength(96);
    e96.forEach((m, i) => expect(m).toBe(Math.round(10 ** (i / 96) * 100) / 100));
    expect(eSeriesMantissas("E48")).toHaveLength(48);
    expect(e96.filter((_, i) => i % 2 === 0)).toEqual(eSeriesMantissas("E48"));
  });

  it("refuses an unknown series", () => {
    expect(() => eSeriesMantissas("E7" as ESeriesName)).toThrow(/E-series must be one of/);
  });
});

describe("nearestPreferred", () => {
  it("finds the nearest value by ratio", () => {
    expect(nearestPreferred(5.0e-9, "E12")).toBe(4.7e-9);
    expect(nearestPreferred(5.3e-9, "E12")).toBe(5.6e-9);
    expect(nearestPreferred(4.35e-6, "E24")).toBe(4.3e-6);
  });

  it("crosses decades", () => {
    expect(nearestPreferred(9.6e-12, "E12")).toBe(1e-11);
    expect(nearestPreferred(0.98, "E96")).toBe(0.976);
    expect(nearestPreferred(1.04e3, "E24")).toBe(1e3);
  });

  it("refuses values that are not above 0", () => {
    expect(() => nearestPreferred(0, "E12")).toThrow(RangeError);
    expect(() => nearestPreferred(Number.NaN, "E12")).toThrow(RangeError);
  });

  it("returns a series value that no other series value beats", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-13, max: 1e7, noNaN: true }), fc.constantFrom(...SERIES), (value, series) => {
        const nearest = nearestPreferred(value, series);
        expect(isPreferred(nearest, series)).toBe(true);
        const mantissa = nearest / 10 ** Math.floor(Math.log10(nearest) + 1e-12);
        expect(eSeriesMantissas(series).some((m) => Math.abs(m - mantissa) < 1e-9)).toBe(true);
        const distance = Math.abs(Math.log(value / nearest));
        for (const other of preferredValuesBetween(value / 20, value * 20, series)) {
          expect(Math.abs(Math.log(value / other))).toBeGreaterThanOrEqual(distance - 1e-15);
        }
      }),
      { seed: 7, numRuns: 500 },
    );
  });
});

describe("nextAbove", () => {
  it("steps up, across a decade", () => {
    expect(nextAbove(4.7e-9, "E12")).toBe(5.6e-9);
    expect(nextAbove(8.2e-9, "E12")).toBe(1e-8);
    expect(nextAbove(9.1e-7, "E24")).toBe(1e-6);
  });

  it("treats a hair below a preferred value as that value", () => {
    expect(nextAbove(4.7e-9 * (1 - 1e-12), "E12")).toBe(5.6e-9);
  });
});

describe("nextBelow", () => {
  it("steps down, across a decade", () => {
    expect(nextBelow(5.6e-9, "E12")).toBe(4.7e-9);
    expect(nextBelow(1e-8, "E12")).toBe(8.2e-9);
    expect(nextBelow(1e-12, "E24")).toBe(9.1e-13);
  });

  it("brackets any value with no series value in between", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-13, max: 1e7, noNaN: true }), fc.constantFrom(...SERIES), (value, series) => {
        const below = nextBelow(value, series);
        const above = nextAbove(value, series);
        expect(below).toBeLessThan(value);
        expect(above).toBeGreaterThan(value);
        // Only the value itself (when it is a series value) may lie strictly between the two.
        const between = preferredValuesBetween(below, above, series).filter(
          (v) => v > below && v < above && Math.abs(v / value - 1) > 1e-9,
        );
        expect(between).toEqual([]);
      }),
      { seed: 11, numRuns: 500 },
    );
  });
});

describe("isPreferred", () => {
  it("recognises series members in any decade", () => {
    expect(isPreferred(4.7e-9, "E6")).toBe(true);
    expect(isPreferred(4.3e-9, "E12")).toBe(false);
    expect(isPreferred(4.3e-9, "E24")).toBe(true);
    expect(isPreferred(-1, "E24")).toBe(false);
  });
});

describe("preferredValuesBetween", () => {
  it("lists the values in a range, ends included", () => {
    expect(preferredValuesBetween(1e-9, 1e-8, "E6")).toEqual([1e-9, 1.5e-9, 2.2e-9, 3.3e-9, 4.7e-9, 6.8e-9, 1e-8]);
    expect(() => preferredValuesBetween(2, 1, "E6")).toThrow(/reversed/);
  });
});
