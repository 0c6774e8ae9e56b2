import { describe, expect, it } from "vitest";
import {
  LIMITS,
  buildDesignReport,
  limitProblem,
  parseTolerance,
  parseValue,
  predictOscillator,
  suggestRetune,
  validateDesign,
  worstCaseBand,
  statisticalBand,
  temperatureShift,
  type OscillatorDesign,
} from "@/lib/oscillator";
import { design, expectRel } from "./expect-close";

// Closed forms, REFERENCES.md §1 [seen]: tank f0 = 1/(2π√(LC)); Colpitts C_eff = C1·C2/(C1+C2);
// Hartley L_eff = L1 + L2 + 2M (−2M opposing), M = k√(L1·L2). The limits keep these inside bench values.
const f0 = (lH: number, cF: number) => 1 / (2 * Math.PI * Math.sqrt(lH * cF));

describe("closed forms at the edges of the bench limits", () => {
  it("predicts a tank at the smallest and largest parts accepted", () => {
    const small = predictOscillator(design("tank", { L: LIMITS.inductanceH.min, C: LIMITS.capacitanceF.min }));
    expectRel(small.predictedHz, f0(1e-9, 0.1e-12), 1e-12);
    // 1/(2π√(1e-22)) = 15.915 GHz [derived]: still inside the 20 GHz frequency limit.
    expect(small.predictedHz).toBeLessThan(LIMITS.frequencyHz.max);
    const large = predictOscillator(design("tank", { L: LIMITS.inductanceH.max, C: LIMITS.capacitanceF.max }));
    expectRel(large.predictedHz, f0(10, 10e-3), 1e-12);
    expect(large.predictedHz).toBeGreaterThan(LIMITS.frequencyHz.min);
  });

  it("takes C1 and C2 of a Colpitts in series", () => {
    const p = predictOscillator(design("colpitts", { L: 10e-6, C1: 10e-9, C2: 15e-9 }));
    expectRel(p.cEffF, (10e-9 * 15e-9) / 25e-9, 1e-12);
    expectRel(p.predictedHz, f0(10e-6, 6e-9), 1e-12);
  });

  it("adds 2M to L1 + L2 of a Hartley", () => {
    const p = predictOscillator(design("hartley", { L1: 10e-6, L2: 40e-6, M: 5e-6, C: 1e-9 }));
    expectRel(p.lEffH, 60e-6, 1e-12);
    expectRel(p.predictedHz, f0(60e-6, 1e-9), 1e-12);
  });
});

describe("limitProblem", () => {
  it("accepts the ends of a range and refuses just outside, in engineering notation with the unit", () => {
    expect(limitProblem("inductanceH", 1e-9, "L")).toBeNull();
    expect(limitProblem("inductanceH", 10, "L")).toBeNull();
    expect(limitProblem("inductanceH", 14.862705002791383e-6, "L")).toBeNull();
    expect(limitProblem("inductanceH", 1e30, "part L")).toBe("part L must be from 1 nH to 10 H; got 1e30 H");
    expect(limitProblem("capacitanceF", 1e-15, "part C")).toBe("part C must be from 100 fF to 10 mF; got 1 fF");
    expect(limitProblem("frequencyHz", 1e30, "the target")).toBe("the target must be from 100 mHz to 20 GHz; got 1e30 Hz");
  });

  it("refuses non-finite values", () => {
    expect(limitProblem("frequencyHz", Number.NaN, "the target")).toMatch(/must be a finite number of Hz; got NaN/);
    expect(limitProblem("capacitanceF", Number.POSITIVE_INFINITY, "C")).toMatch(/got Infinity/);
  });

  it("never lets a temperature change reach absolute zero from 25 °C", () => {
    // 0 K = −273.15 °C, so from 25 °C the change must stay above −298.15 K (common practice: tempcos quoted from 25 °C).
    expect(limitProblem("temperatureChangeK", -298, "ΔT")).toBeNull();
    expect(limitProblem("temperatureChangeK", -298.15, "ΔT")).toMatch(/absolute zero/);
    expect(limitProblem("temperatureChangeK", -2000, "ΔT")).toBe(
      "ΔT must be above -298.15 K and up to 500 K; got -2000 K (that is at or below absolute zero)",
    );
    expect(limitProblem("temperatureChangeK", 501, "ΔT")).toMatch(/up to 500 K; got 501 K/);
    const c0g: OscillatorDesign = { topology: "tank", parts: { L: { valueSi: 10e-6 }, C: { valueSi: 1e-9, tempcoPpmPerK: -750 } } };
    expect(() => temperatureShift(c0g, -2000)).toThrow(/temperature change from 25 °C must be above -298.15 K .* got -2000 K/);
    // Linear tempco, f ∝ C^−½ (REFERENCES.md §1 sensitivity): −750 ppm/K × 40 K → C × 0.97, f × 0.97^−½ [derived].
    expectRel(temperatureShift(c0g, 40).shiftedHz, f0(10e-6, 1e-9 * (1 - 750e-6 * 40)), 1e-12);
  });

  it("shows tolerances as percentages and the feedback fraction as a plain ratio", () => {
    expect(limitProblem("tolerance", 0.6, "the tolerance")).toBe("the tolerance must be from 0 % to 50 %; got 60 %");
    expect(limitProblem("feedbackFraction", 4.5e38, "β")).toBe("β must be from 0.001 to 1000; got 4.5e+38");
  });
});

describe("validateDesign with the bench limits", () => {
  it("refuses the absurd values of issue 12 with the value in engineering notation", () => {
    expect(validateDesign(design("tank", { L: 1e30, C: 1e-9 }))).toEqual([
      "part L (tank inductor) must be from 1 nH to 10 H; got 1e30 H",
    ]);
    const tiny = validateDesign(design("tank", { L: 1e-15, C: 1e-15 }));
    expect(tiny).toHaveLength(2);
    expect(tiny[1]).toMatch(/part C .* got 1 fF$/);
  });

  it("refuses a divider no transistor stage could start", () => {
    // β = C1/C2 (REFERENCES.md §1): 1 nF over 10 mF is 10⁻⁷, a gain of 10⁷ to start.
    const problems = validateDesign(design("colpitts", { L: 10e-6, C1: 1e-9, C2: 10e-3 }));
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(/^the feedback fraction β must be from 0.001 to 1000; got 1e-7 .*gain of 1\.00e7 to start/);
  });

  it("names M's bound in engineering notation", () => {
    expect(validateDesign(design("hartley", { L1: 1e-6, L2: 4e-6, C: 1e-9, M: 3e-6 }))[0]).toBe(
      "part M must not exceed √(L1·L2) = 2.000 µH (coupling k = 1); got 3.000 µH",
    );
  });
});

describe("tolerance corners that make the model invalid", () => {
  // Opposing windings, L1 = L2, k near 1: L_eff = L1 + L2 − 2k√(L1·L2) is 0.2 µH nominal [derived], and the corner
  // with both windings and k up clamps k to 1, where L_eff = (√L1 − √L2)² = 0.
  const cancelling: OscillatorDesign = {
    topology: "hartley",
    windings: "opposing",
    parts: { L1: { valueSi: 10e-6, tolerance: 0.1 }, L2: { valueSi: 10e-6, tolerance: 0.1 }, k: { valueSi: 0.99, tolerance: 0.05 }, C: { valueSi: 1e-9 } },
  };

  it("keeps the nominal prediction and counts the corners that are no tank", () => {
    const report = buildDesignReport(cancelling, { statistical: { trials: 500 } });
    expectRel(report.lEffH, 20e-6 - 2 * 0.99 * 10e-6, 1e-9);
    expectRel(report.predictedHz, f0(0.2e-6, 1e-9), 1e-9);
    expect(report.worstCase.invalidCorners).toBe(2);
    expect(report.worstCase.invalidReason).toMatch(/effective inductance must be a finite number above 0 H; got 0 H/);
    expect(report.bandWarning).toMatch(/^2 of 8 tolerance corners make the model invalid/);
    expect(Number.isFinite(report.worstCase.minHz) && Number.isFinite(report.worstCase.maxHz)).toBe(true);
  });

  it("reports no warning when every corner is a tank", () => {
    const band = worstCaseBand(design("tank", { L: 10e-6, C: 1e-9 }, { L: 0.1, C: 0.05 }));
    expect(band.invalidCorners).toBe(0);
    expect(buildDesignReport(design("tank", { L: 10e-6, C: 1e-9 }, { C: 0.05 }), { statistical: { trials: 200 } }).bandWarning).toBeNull();
    expect(statisticalBand(design("tank", { L: 10e-6, C: 1e-9 }, { C: 0.05 }), { trials: 200 }).invalidTrials).toBe(0);
  });
});

describe("decimal commas", () => {
  it("reads a comma as the decimal mark, as the CSV importer does", () => {
    expect(parseValue("4,7nF", "F")).toBe(4.7e-9);
    expect(parseValue("4,7 nF", "F")).toBe(4.7e-9);
    expect(parseValue("1,5 MHz", "Hz")).toBe(1.5e6);
    expect(parseValue("0,470u", "H")).toBe(4.7e-7);
    expect(parseTolerance("2,5 %")).toBe(0.025);
  });

  it("refuses a comma that could be a thousands separator, or two marks", () => {
    expect(() => parseValue("4,700 pF", "F")).toThrow(/decimal mark or a thousands separator; write 4.700 or 4700/);
    expect(() => parseValue("1.2,3n", "F")).toThrow(/a comma is read as the decimal mark/);
    expect(() => parseValue("1,2,3n", "F")).toThrow(/a comma is read as the decimal mark/);
  });
});

describe("suggestRetune limits and reach", () => {
  it("refuses a target outside the bench limits", () => {
    expect(() => suggestRetune(design("tank", { L: 10e-6, C: 1e-9 }), { targetHz: 1e30 })).toThrow(
      "the target frequency must be from 100 mHz to 20 GHz; got 1e30 Hz",
    );
  });

  it("says a Clapp target below the Colpitts limit cannot be reached, with the nearest reachable frequency", () => {
    // C3 → ∞ leaves C1 and C2 in series (REFERENCES.md §1): L = 100 µH, 500 pF → 711.8 kHz [derived]. Within three
    // decades C3 reaches 100 nF: C_eff = 1/(1/1n + 1/1n + 1/100n) = 497.51 pF → 713.54 kHz, the nearest reachable.
    const clapp = design("clapp", { L: 100e-6, C1: 1e-9, C2: 1e-9, C3: 100e-12 });
    const r = suggestRetune(clapp, { targetHz: 500e3 });
    expect(r.reachable).toBe(false);
    const cEff = 1 / (1 / 1e-9 + 1 / 1e-9 + 1 / 100e-9);
    expectRel(r.nearestReachableHz as number, f0(100e-6, cEff), 1e-9);
    expect(r.unreachableReason).toMatch(/the 500 kHz target cannot be reached by changing any one of C1, C2 or C3/);
    expect(r.unreachableReason).toMatch(/nearest reachable frequency is 713\.540 kHz/);
  });

  it("reaches a target inside the span and says so", () => {
    const r = suggestRetune(design("tank", { L: 100e-6, C: 100e-12 }), { targetHz: f0(100e-6, 120e-12) });
    expect(r.reachable).toBe(true);
    expect(r.nearestReachableHz).toBeNull();
    expect(r.unreachableReason).toBeNull();
    expect(r.reachableBand.minHz).toBeLessThan(r.targetHz);
    expect(r.reachableBand.maxHz).toBeGreaterThan(r.targetHz);
  });

  it("shows β and the start-up gain before and after, and warns when a larger C2 shrinks the margin", () => {
    // Colpitts β = C1/C2 (REFERENCES.md §1): C2 15 → 27 nF takes β from 0.667 to 0.370 and the gain to start from
    // 1.5 to 2.7 [derived]. Target: the f0 with C2 = 27 nF, an E12 value.
    const colpitts = design("colpitts", { L: 10e-6, C1: 10e-9, C2: 15e-9 });
    const targetHz = f0(10e-6, (10e-9 * 27e-9) / 37e-9);
    const r = suggestRetune(colpitts, { targetHz, part: "C2" });
    expect(r.toSi).toBe(27e-9);
    expectRel(r.feedbackFractionBefore as number, 10 / 15, 1e-12);
    expectRel(r.feedbackFraction as number, 10 / 27, 1e-12);
    expectRel(r.minGainBefore as number, 1.5, 1e-12);
    expectRel(r.minGain as number, 2.7, 1e-12);
    expect(r.startupWarning).toBe(
      "C2 15 nF → 27 nF moves the feedback fraction β from 0.667 to 0.37 and raises the minimum gain to start from 1.5 " +
        "to 2.7 (×1.8): less start-up margin, so check the amplifier has that gain to spare, or retune with another part",
    );
  });

  it("does not warn when the change eases start-up", () => {
    const colpitts = design("colpitts", { L: 10e-6, C1: 10e-9, C2: 15e-9 });
    const r = suggestRetune(colpitts, { targetHz: f0(10e-6, (10e-9 * 10e-9) / 20e-9), part: "C2" });
    expect(r.toSi).toBe(10e-9);
    expect(r.minGain as number).toBeLessThan(r.minGainBefore as number);
    expect(r.startupWarning).toBeNull();
  });

  it("is on target when the present f0 is within the tolerance given", () => {
    const tank = design("tank", { L: 100e-6, C: 100e-12 });
    const nominal = f0(100e-6, 100e-12);
    const near = suggestRetune(tank, { targetHz: nominal * 1.001, targetToleranceHz: nominal * 0.002 });
    expect(near.onTarget).toBe(true);
    expectRel(near.currentHz, nominal, 1e-12);
    const far = suggestRetune(tank, { targetHz: nominal * 1.01, targetToleranceHz: nominal * 0.002 });
    expect(far.onTarget).toBe(false);
    expect(suggestRetune(tank, { targetHz: nominal }).onTarget).toBe(false);
  });
});
