import { describe, expect, it } from "vitest";
import { analyseDrift, impliedExtraCapacitanceF, impliedInductanceErrorH, predictOscillator } from "@/lib/oscillator";
import { design, expectAbs, expectRel } from "./expect-close";

describe("impliedExtraCapacitanceF", () => {
  it("gives 2.135985 pF for the 96.86 MHz Colpitts measured at 90 MHz", () => {
    // REFERENCES.md §1 row 14 [derived]: tank of row 1 (C_eff 13.5 pF, L 0.2 µH) measured at 90.000 MHz.
    expectRel(impliedExtraCapacitanceF(0.2e-6, 13.5e-12, 90e6), 2.135985e-12, 1e-6);
  });

  it("gives 56.33432 pF for the FET Colpitts measured at 1 MHz", () => {
    // REFERENCES.md §1 row 15 [derived]: tank of row 2 (C_eff 576.923 pF, L 40 µH) measured at 1.000000 MHz.
    const p = predictOscillator(design("colpitts", { L: 40e-6, C1: 750e-12, C2: 2500e-12 }));
    expectRel(impliedExtraCapacitanceF(p.lEffH, p.cEffF, 1e6), 56.33432e-12, 1e-6);
  });

  it("equals C_eff·[(f0/f)² − 1]", () => {
    // REFERENCES.md §1 (derived) second form.
    const f0 = predictOscillator(design("tank", { L: 1e-4, C: 1e-10 })).predictedHz;
    expectRel(impliedExtraCapacitanceF(1e-4, 1e-10, 0.97 * f0), 1e-10 * ((1 / 0.97) ** 2 - 1), 1e-9);
  });

  it("refuses a frequency that is not above 0", () => {
    expect(() => impliedExtraCapacitanceF(1e-4, 1e-10, 0)).toThrow(/measured frequency/);
  });
});

describe("impliedInductanceErrorH", () => {
  it("is L·[(f0/f)² − 1]", () => {
    const f0 = predictOscillator(design("tank", { L: 1e-4, C: 1e-10 })).predictedHz;
    expectRel(impliedInductanceErrorH(1e-4, 1e-10, 1.05 * f0), 1e-4 * ((1 / 1.05) ** 2 - 1), 1e-9);
  });
});

/** A Colpitts that predicts exactly 370 kHz with C1 = C2 and L = 100 µH. */
function colpittsAt370k() {
  const cEffF = 1 / ((2 * Math.PI * 370e3) ** 2 * 100e-6);
  return design("colpitts", { L: 100e-6, C1: 2 * cEffF, C2: 2 * cEffF });
}

describe("analyseDrift", () => {
  it("does the arithmetic for a breadboard calculated at 370 kHz that measures 390 kHz", () => {
    // Common practice, no source: a breadboarded Colpitts calculated at about 370 kHz commonly measures near
    // 390 kHz (about +5 %) because of layout and parasitics. Arithmetic: +20 kHz, +5.4054 %, +54054 ppm.
    const d = colpittsAt370k();
    expectRel(predictOscillator(d).predictedHz, 370e3, 1e-12);
    const drift = analyseDrift(d, 390e3);
    expectRel(drift.hz, 20e3, 1e-9);
    expectAbs(drift.percent, 5.405405, 1e-6);
    expectAbs(drift.ppm, 54054.054, 1e-3);
    expect(drift.direction).toBe("above");
    // Above the prediction: less capacitance (C_eff·[(370/390)² − 1], derived) or less inductance than modelled.
    const cEffF = predictOscillator(d).cEffF;
    expectRel(drift.impliedExtraCapacitanceF, cEffF * ((370 / 390) ** 2 - 1), 1e-9);
    expect(drift.impliedExtraCapacitanceF).toBeLessThan(0);
    expect(drift.impliedInductanceErrorH).toBeLessThan(0);
    expectAbs(drift.impliedInductanceErrorPercent, ((370 / 390) ** 2 - 1) * 100, 1e-9);
    expect(drift.explanation).toMatch(/above the prediction, so the tank has less capacitance or less inductance than the model/);
    expect(drift.explanation).toMatch(/equivalent parallel value/);
    expect(drift.explanation).not.toMatch(/stray|parasitic/i);
  });

  it("explains a frequency below the prediction as extra parallel capacitance", () => {
    const drift = analyseDrift(colpittsAt370k(), 350e3);
    expect(drift.direction).toBe("below");
    expect(drift.impliedExtraCapacitanceF).toBeGreaterThan(0);
    expect(drift.explanation).toMatch(/below the prediction\. An extra .*pF in parallel with the tank/);
    expect(drift.explanation).toMatch(/across C1 or C2 alone/);
    expect(drift.explanation).toMatch(/more than modelled/);
  });

  it("says the lumping is across the whole tank for a Hartley", () => {
    const drift = analyseDrift(design("hartley", { L1: 10e-6, L2: 40e-6, C: 100e-12 }), 2.2e6);
    expect(drift.explanation).toMatch(/lumped across the tank/);
  });

  it("reports a match within 1 ppm", () => {
    const d = design("tank", { L: 1e-4, C: 1e-10 });
    const drift = analyseDrift(d, predictOscillator(d).predictedHz * (1 + 1e-7));
    expect(drift.direction).toBe("on");
    expect(drift.explanation).toMatch(/matches the prediction/);
  });

  it("does not count a declared probe capacitance again", () => {
    // REFERENCES.md §7: subtract probe C before inferring board stray.
    const bare = design("tank", { L: 100e-6, C: 100e-12 });
    const probed = { ...bare, extraCapacitanceF: 12e-12 };
    const measuredHz = predictOscillator({ ...bare, extraCapacitanceF: 15e-12 }).predictedHz;
    expectRel(analyseDrift(probed, measuredHz).impliedExtraCapacitanceF, 3e-12, 1e-9);
    expectRel(analyseDrift(bare, measuredHz).impliedExtraCapacitanceF, 15e-12, 1e-9);
  });

  it("refuses a bad measurement", () => {
    expect(() => analyseDrift(colpittsAt370k(), Number.NaN)).toThrow(/measured frequency must be a finite number above 0 Hz/);
  });
});
