import { describe, expect, it } from "vitest";
import { suggestRetune } from "@/lib/oscillator";

// Closed form, common practice: f0 = 1/(2π√(L·C_total)), the calibration taken in parallel with C (REFERENCES §1,
// stray-capacitance inference, "lumped across the tank").
const f0 = (lH: number, cF: number) => 1 / (2 * Math.PI * Math.sqrt(lH * cF));
const pF = 1e-12;
const tank = { topology: "tank" as const, parts: { L: { valueSi: 10e-6, tolerance: 0.05 }, C: { valueSi: 1e-9, tolerance: 0.05 } } };

describe("suggestRetune with the lab's calibration", () => {
  it("takes_the_given_capacitance_as_real_instead_of_the_measured_one", () => {
    const targetHz = 1.5e6;
    // The run measured as if 5 pF were added; the lab's builds of this construction add 40 pF.
    const measuredHz = f0(10e-6, 1e-9 + 5 * pF);
    const own = suggestRetune(tank, { targetHz, measuredHz, series: "E24" });
    const lab = suggestRetune(tank, { targetHz, measuredHz, series: "E24", calibrationCapacitanceF: 40 * pF });
    expect(own.calibrationCapacitanceF).toBeCloseTo(5 * pF, 18);
    expect(lab.calibrationCapacitanceF).toBe(40 * pF);
    // Each prediction is the closed form with its own calibration across the new C.
    expect(own.predictedHz / f0(10e-6, own.toSi + 5 * pF) - 1).toBeCloseTo(0, 9);
    expect(lab.predictedHz / f0(10e-6, lab.toSi + 40 * pF) - 1).toBeCloseTo(0, 9);
    // Hand: 1.5 MHz on 10 µH needs C_total = 1/((2π·1.5 MHz)²·10 µH) = 1.1258 nF, so the ideal C is that less the
    // calibration: 1.1208 nF with the run's 5 pF, 1.0858 nF with the lab's 40 pF.
    expect(lab.idealSi! / (1 / ((2 * Math.PI * targetHz) ** 2 * 10e-6) - 40 * pF) - 1).toBeCloseTo(0, 9);
    expect(lab.idealSi!).toBeLessThan(own.idealSi!);
  });

  it("refuses_a_calibration_that_is_not_finite", () => {
    expect(() => suggestRetune(tank, { targetHz: 1.5e6, calibrationCapacitanceF: Number.NaN })).toThrow(/finite number of F/);
  });
});
