import { describe, expect, it } from "vitest";
import { frequencyShiftForPartChanges, temperatureShift, type OscillatorDesign } from "@/lib/oscillator";
import { design, expectAbs, expectRel } from "./expect-close";

const tank = design("tank", { L: 100e-6, C: 100e-12 });

describe("frequencyShiftForPartChanges", () => {
  it("gives the exact and linear shift for ±0.3 % on C", () => {
    // REFERENCES.md §8 [computed]: ΔC/C ±0.3 % (C0G life/temperature figure) → exact −0.149663 % / +0.150338 %.
    const up = frequencyShiftForPartChanges(tank, { C: 0.003 });
    const down = frequencyShiftForPartChanges(tank, { C: -0.003 });
    expectAbs(up.exactFraction * 100, -0.149663, 1e-6);
    expectAbs(down.exactFraction * 100, 0.150338, 1e-6);
    expectAbs(up.linearFraction * 100, -0.15, 1e-9);
  });

  it("gives the exact shift for an X7R at ±15 %", () => {
    // REFERENCES.md §8 [computed]: X7R +15 % → −6.7495 %, −15 % → +8.4652 % (linear ∓7.5 %).
    expectAbs(frequencyShiftForPartChanges(tank, { C: 0.15 }).exactFraction * 100, -6.7495, 1e-4);
    expectAbs(frequencyShiftForPartChanges(tank, { C: -0.15 }).exactFraction * 100, 8.4652, 1e-4);
    expectAbs(frequencyShiftForPartChanges(tank, { C: 0.15 }).linearFraction * 100, -7.5, 1e-8);
  });

  it("matches the exact two-part form (1+ΔL/L)^−½·(1+ΔC/C)^−½", () => {
    // REFERENCES.md §1 (derived) exact form.
    const shift = frequencyShiftForPartChanges(tank, { L: 0.02, C: -0.01 });
    expectRel(shift.shiftedHz / shift.nominalHz, (1.02 ** -0.5) * (0.99 ** -0.5), 1e-12);
    expectAbs(shift.linearFraction, -0.5 * (0.02 - 0.01), 1e-11);
  });

  it("applies a change to C2 alone in a Colpitts, not to C_eff", () => {
    // REFERENCES.md §8: with mixed dielectrics apply ΔC to C1 and C2 separately; never ±15 % on C_eff.
    // C1 = C2 = 1 nF, X7R C2 +15 %: C_eff' = 1.15/2.15 nF, so f'/f − 1 = −3.31584 % [derived], not −6.7495 %.
    const colpitts = design("colpitts", { L: 100e-6, C1: 1e-9, C2: 1e-9 });
    const shift = frequencyShiftForPartChanges(colpitts, { C2: 0.15 });
    expectAbs(shift.exactFraction * 100, -3.315844, 1e-5);
  });

  it("refuses unknown parts and impossible changes", () => {
    expect(() => frequencyShiftForPartChanges(tank, { C1: 0.1 })).toThrow(/part C1 is not in this tank design/);
    expect(() => frequencyShiftForPartChanges(tank, { C: -1 })).toThrow(/above -1/);
  });
});

describe("temperatureShift", () => {
  it("gives ∓900 ppm linear for a C0G worst case over 60 K", () => {
    // REFERENCES.md §8: C0G 0 ± 30 ppm/°C (TDK FAQ; KYOCERA AVX); over ΔT = 60 K ΔC/C ±1800 ppm → Δf/f ∓900 ppm linear.
    const c0g: OscillatorDesign = {
      topology: "tank",
      parts: { L: { valueSi: 100e-6 }, C: { valueSi: 100e-12, tempcoPpmPerK: 30 } },
    };
    const shift = temperatureShift(c0g, 60);
    expectAbs(shift.linearFraction * 1e6, -900, 1e-6);
    // Exact: (1.0018)^−½ − 1 = −898.787 ppm [computed].
    expectAbs(shift.exactFraction * 1e6, -898.7868, 1e-3);
  });

  it("spans the tempco spread", () => {
    const c0g: OscillatorDesign = {
      topology: "tank",
      parts: { L: { valueSi: 100e-6 }, C: { valueSi: 100e-12, tempcoPpmPerK: 0, tempcoSpreadPpmPerK: 30 } },
    };
    const shift = temperatureShift(c0g, 60);
    expect(shift.shiftedHz).toBe(shift.nominalHz);
    expectRel(shift.minHz, shift.nominalHz * 1.0018 ** -0.5, 1e-12);
    expectRel(shift.maxHz, shift.nominalHz * 0.9982 ** -0.5, 1e-12);
  });

  it("adds an inductor and an N750 capacitor with df/f = −½(dL/L + dC/C)", () => {
    // REFERENCES.md §1/§8 (derived): +50 ppm/K on L, −750 ppm/K on C over +10 K → −½(500 − 7500) ppm = +3500 ppm.
    const d: OscillatorDesign = {
      topology: "tank",
      parts: { L: { valueSi: 100e-6, tempcoPpmPerK: 50 }, C: { valueSi: 100e-12, tempcoPpmPerK: -750 } },
    };
    expectAbs(temperatureShift(d, 10).linearFraction * 1e6, 3500, 1e-5);
  });

  it("refuses a non-finite temperature change", () => {
    expect(() => temperatureShift(tank, Number.NaN)).toThrow(/temperature change/);
  });
});
