import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  analyseDrift,
  frequencyFromValues,
  isPreferred,
  predictOscillator,
  preferredValuesBetween,
  retunableParts,
  solvePartValue,
  suggestRetune,
  worstCaseBand,
  type ESeriesName,
} from "@/lib/oscillator";
import { design, expectRel } from "./expect-close";

describe("solvePartValue", () => {
  it("finds L1 of a Hartley with L2 = 0.4 mH, C = 0.004 µF for 120 kHz", () => {
    // REFERENCES.md §1 row 10: Mehta-style problem, L1 ≈ 0.04 mH (from memory); computed L1 + L2 0.439762 mH,
    // L1 0.0397621 mH.
    const d = design("hartley", { L1: 0.1e-3, L2: 0.4e-3, C: 0.004e-6 });
    const l1 = solvePartValue(d, "L1", 120e3) as number;
    expectRel(l1 + 0.4e-3, 0.439762e-3, 1e-5);
    expectRel(l1, 0.0397621e-3, 1e-5);
  });

  it("returns null when the part cannot reach the target", () => {
    // A Clapp's C3 cannot pull f0 below the Colpitts limit set by C1 and C2.
    const d = design("clapp", { L: 100e-6, C1: 1e-9, C2: 1e-9, C3: 100e-12 });
    const limitHz = frequencyFromValues("colpitts", { L: 100e-6, C1: 1e-9, C2: 1e-9 });
    expect(solvePartValue(d, "C3", 0.9 * limitHz)).toBeNull();
  });

  it("refuses the coupling as a retune part", () => {
    expect(() => solvePartValue(design("hartley", { L1: 1e-6, L2: 1e-6, C: 1e-9, k: 0.2 }), "k", 1e6)).toThrow(
      /part k cannot be retuned/,
    );
  });
});

describe("retunableParts", () => {
  it("lists L and C parts only", () => {
    expect(retunableParts(design("hartley", { L1: 1e-6, L2: 1e-6, C: 1e-9, M: 1e-7 }))).toEqual(["L1", "L2", "C"]);
  });
});

describe("suggestRetune", () => {
  const tank = design("tank", { L: 100e-6, C: 100e-12 }, { C: 0.05, L: 0.1 });

  it("picks the exact E24 value when the target sits on one", () => {
    const targetHz = frequencyFromValues("tank", { L: 100e-6, C: 110e-12 });
    const r = suggestRetune(tank, { targetHz, series: "E24" });
    expect(r.part).toBe("C");
    expect(r.toF).toBe(1.1e-10);
    expect(r.fromF).toBe(1e-10);
    expect(r.fromH).toBeNull();
    expect(r.changed).toBe(true);
    expectRel(r.predictedHz, targetHz, 1e-12);
    expectRel(r.idealSi as number, 110e-12, 1e-9);
  });

  it("picks the E12 neighbour that lands closest", () => {
    const targetHz = frequencyFromValues("tank", { L: 100e-6, C: 110e-12 });
    const r = suggestRetune(tank, { targetHz, series: "E12" });
    // 110 pF lies between E12 100 pF and 120 pF; 1/√C makes 100 pF land 4.88 % high, 120 pF 4.26 % low.
    expect(r.toF).toBe(1.2e-10);
    expect(r.worstCase.minHz).toBeLessThan(r.predictedHz);
    expect(r.worstCase.maxHz).toBeGreaterThan(r.predictedHz);
    expect(r.statistical.minHz).toBeLessThan(r.predictedHz);
    // The new part keeps the old tolerance, so the band is the worst case of the changed design.
    expect(r.worstCase).toEqual({ minHz: worstCaseBand(r.design).minHz, maxHz: worstCaseBand(r.design).maxHz });
  });

  it("keeps the current value when a measurement already sits on the target", () => {
    const d = design("colpitts", { L: 100e-6, C1: 1e-9, C2: 4.7e-9 });
    const r = suggestRetune(d, { targetHz: 412.3e3, measuredHz: 412.3e3 });
    expect(r.changed).toBe(false);
    expectRel(r.predictedHz, 412.3e3, 1e-9);
  });

  it("takes the capacitance implied by the measurement as real", () => {
    const d = design("colpitts", { L: 100e-6, C1: 1e-9, C2: 4.7e-9 });
    const r = suggestRetune(d, { targetHz: 400e3, measuredHz: 412.3e3, series: "E12", part: "C2" });
    const implied = analyseDrift(d, 412.3e3).impliedExtraCapacitanceF;
    expectRel(r.calibrationCapacitanceF, implied, 1e-12);
    const expected = frequencyFromValues("colpitts", { L: 100e-6, C1: 1e-9, C2: r.toSi }, implied);
    expectRel(r.predictedHz, expected, 1e-12);
    expect(r.part).toBe("C2");
  });

  it("works when the build runs above its model (negative implied capacitance)", () => {
    const d = design("colpitts", { L: 100e-6, C1: 1e-9, C2: 4.7e-9 });
    const f0 = predictOscillator(d).predictedHz;
    const r = suggestRetune(d, { targetHz: f0, measuredHz: 1.05 * f0, series: "E24" });
    expect(r.calibrationCapacitanceF).toBeLessThan(0);
    expect(r.predictedHz).toBeLessThan(1.05 * f0);
    expect(Math.abs(r.errorPercent)).toBeLessThan(5);
  });

  it("retunes an inductor when asked", () => {
    const r = suggestRetune(tank, { targetHz: 1.4e6, part: "L", series: "E12" });
    expect(r.unit).toBe("H");
    expect(r.fromH).toBe(100e-6);
    expect(r.fromF).toBeNull();
    expect(isPreferred(r.toSi, "E12")).toBe(true);
  });

  it("refuses a part that is not retunable and a bad target", () => {
    expect(() => suggestRetune(tank, { targetHz: 1e6, part: "C1" })).toThrow(/part C1 cannot be retuned in this tank design/);
    expect(() => suggestRetune(tank, { targetHz: -1 })).toThrow(/target frequency/);
  });

  it("finds a standard value no other beats, over every capacitor", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 2, noNaN: true }),
        fc.constantFrom<ESeriesName>("E12", "E24"),
        (ratio, series) => {
          const d = design("clapp", { L: 100e-6, C1: 1e-9, C2: 2.2e-9, C3: 220e-12 });
          const targetHz = predictOscillator(d).predictedHz * ratio;
          const r = suggestRetune(d, { targetHz, series, statistical: { trials: 200 } });
          const bestError = Math.abs(r.predictedHz - targetHz);
          for (const ref of ["C1", "C2", "C3"]) {
            const current = d.parts[ref].valueSi;
            for (const v of preferredValuesBetween(current / 1000, current * 1000, series)) {
              const values = { L: 100e-6, C1: 1e-9, C2: 2.2e-9, C3: 220e-12, [ref]: v };
              const f = frequencyFromValues("clapp", values);
              expect(Math.abs(f - targetHz)).toBeGreaterThanOrEqual(bestError * (1 - 1e-9));
            }
          }
          if (r.changed) expect(isPreferred(r.toSi, series)).toBe(true);
        },
      ),
      { seed: 13, numRuns: 60 },
    );
  });
});
