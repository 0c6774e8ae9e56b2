import { describe, expect, it } from "vitest";
import { LAB_SPREAD_SIGMAS, calibratedFrequencyHz, calibratedPrediction } from "@/lib/layouts/calibrated-prediction";
import { expectRel } from "../oscillator/expect-close";

// Closed form, common practice (any RF handbook): f0 = 1/(2π√(L·C_total)) with every parallel capacitance in C_total.
const f0 = (lH: number, cF: number) => 1 / (2 * Math.PI * Math.sqrt(lH * cF));
const pF = 1e-12;

describe("calibratedPrediction", () => {
  it("adds_the_lab_figure_in_parallel_with_the_tank_capacitance", () => {
    const design = { topology: "tank" as const, parts: { L: { valueSi: 10e-6 }, C: { valueSi: 1e-9 } } };
    const p = calibratedPrediction(design, { medianF: 20 * pF, spreadF: 2 * pF }, { trials: 200 });
    expectRel(p.asDesigned.predictedHz, f0(10e-6, 1e-9), 1e-12);
    expectRel(p.asBuilt.predictedHz, f0(10e-6, 1.02e-9), 1e-12);
    expectRel(p.asBuilt.cEffF, 1.02e-9, 1e-12);
    expect(p.shiftHz).toBeLessThan(0);
    expectRel(p.shiftHz, f0(10e-6, 1.02e-9) - f0(10e-6, 1e-9), 1e-9);
  });

  it("a_negative_figure_raises_the_frequency", () => {
    const design = { topology: "tank" as const, parts: { L: { valueSi: 10e-6 }, C: { valueSi: 1e-9 } } };
    const p = calibratedPrediction(design, { medianF: -5 * pF, spreadF: null }, { trials: 200 });
    expectRel(p.asBuilt.predictedHz, f0(10e-6, 0.995e-9), 1e-12);
    expect(p.labSpreadF).toBe(0);
  });

  it("keeps_the_design_s_own_extra_capacitance_and_adds_the_lab_s_to_a_colpitts", () => {
    // C_eff = C1·C2/(C1 + C2) = 0.5 nF, + 10 pF declared + 12 pF from the lab.
    const design = {
      topology: "colpitts" as const,
      parts: { L: { valueSi: 15e-6 }, C1: { valueSi: 1e-9 }, C2: { valueSi: 1e-9 } },
      extraCapacitanceF: 10 * pF,
    };
    const p = calibratedPrediction(design, { medianF: 12 * pF, spreadF: 1 * pF }, { trials: 200 });
    expectRel(p.asDesigned.predictedHz, f0(15e-6, 0.51e-9), 1e-12);
    expectRel(p.asBuilt.predictedHz, f0(15e-6, 0.522e-9), 1e-12);
    expectRel(calibratedFrequencyHz(design, 12 * pF), f0(15e-6, 0.522e-9), 1e-12);
  });

  it("widens_the_worst_case_to_the_corners_at_the_lab_figure_plus_and_minus_three_spreads", () => {
    const design = { topology: "tank" as const, parts: { L: { valueSi: 10e-6, tolerance: 0.05 }, C: { valueSi: 1e-9, tolerance: 0.05 } } };
    const p = calibratedPrediction(design, { medianF: 20 * pF, spreadF: 2 * pF }, { trials: 2000 });
    expect(LAB_SPREAD_SIGMAS).toBe(3);
    // Low corner: L and C at +5 %, the lab at 20 + 3·2 pF; high corner: both at −5 %, the lab at 20 − 6 pF.
    expectRel(p.asBuilt.worstCase.minHz, f0(10.5e-6, 1.05e-9 + 26 * pF), 1e-12);
    expectRel(p.asBuilt.worstCase.maxHz, f0(9.5e-6, 0.95e-9 + 14 * pF), 1e-12);
    expectRel(p.asDesigned.worstCase.minHz, f0(10.5e-6, 1.05e-9), 1e-12);
    expect(p.asBuilt.statistical.minHz).toBeLessThan(p.asBuilt.predictedHz);
    expect(p.asBuilt.statistical.maxHz).toBeGreaterThan(p.asBuilt.predictedHz);
  });

  it("widens_the_statistical_band_by_the_spread_in_quadrature", () => {
    // Parts without tolerance: the design's own band is a point, so the band is f ± 3·σ_f with σ_f = f·σ_C/(2·C).
    const design = { topology: "tank" as const, parts: { L: { valueSi: 10e-6 }, C: { valueSi: 1e-9 } } };
    const p = calibratedPrediction(design, { medianF: 20 * pF, spreadF: 2 * pF }, { trials: 200 });
    const f = f0(10e-6, 1.02e-9);
    const sigma = (f * 2 * pF) / (2 * 1.02e-9);
    expectRel(p.asBuilt.statistical.maxHz - f, 3 * sigma, 1e-9);
    expectRel(f - p.asBuilt.statistical.minHz, 3 * sigma, 1e-9);
    expectRel(p.asDesigned.statistical.maxHz, f0(10e-6, 1e-9), 1e-12);
  });

  it("refuses_a_figure_that_leaves_no_capacitance", () => {
    const design = { topology: "tank" as const, parts: { L: { valueSi: 10e-6 }, C: { valueSi: 10 * pF } } };
    expect(() => calibratedPrediction(design, { medianF: -9 * pF, spreadF: 1 * pF })).toThrow(/would leave no capacitance/);
    expect(() => calibratedPrediction(design, { medianF: Number.NaN, spreadF: null })).toThrow(/finite number of F/);
    expect(() => calibratedPrediction(design, { medianF: 1 * pF, spreadF: -1 })).toThrow(/0 or above/);
  });
});
