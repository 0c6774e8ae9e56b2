import { describe, expect, it } from "vitest";
import { isPreferred } from "@/lib/oscillator/e-series";
import { proposeValues } from "@/lib/oscillator/value-proposal";

// Closed forms written out here, independent of lib/oscillator: f0 = 1/(2π√(L·C_eff)) (the LC resonance), the
// Colpitts divider C_eff = C1·C2/(C1+C2), the two capacitors in series across L (A. Collinson, "Colpitts
// oscillator frequency", zen22142.zen.co.uk/Analysis/colfr.htm; REFERENCES §1), the Clapp 1/C_eq = 1/C1 + 1/C2 +
// 1/C3 (rfessentials.com "Clapp Oscillator"), and the lab's figure C_lab in parallel with C_eff.
const f0 = (lH: number, cF: number) => 1 / (2 * Math.PI * Math.sqrt(lH * cF));
const series2 = (a: number, b: number) => (a * b) / (a + b);
const pF = 1e-12;

describe("proposeValues", () => {
  it("finds_the_tutorial_colpitts_100p_200p_on_10u_in_e24", () => {
    // REFERENCES §1 row 7 (IIT(ISM) NPHC206 tutorial): C1 = 100 pF, C2 = 200 pF, L = 10 µH → 6.1640444 MHz.
    const [p] = proposeValues({ topology: "colpitts", targetHz: 6.1640444e6, series: "E24", fixed: { L: 10e-6 }, dividerRatio: 2 });
    expect(p.values.C1).toBeCloseTo(100 * pF, 20);
    expect(p.values.C2).toBeCloseTo(200 * pF, 20);
    expect(Math.abs(p.errorPpm)).toBeLessThan(0.1);
    expect(p.predictedHz / f0(10e-6, series2(100 * pF, 200 * pF)) - 1).toBeCloseTo(0, 12);
  });

  it("lands_a_colpitts_on_target_as_built_with_the_lab_s_figure_in_parallel", () => {
    const targetHz = 1.0e6;
    const labF = 12 * pF;
    const proposals = proposeValues({ topology: "colpitts", targetHz, series: "E12", labCapacitanceF: labF, dividerRatio: 2 });
    expect(proposals).toHaveLength(3);
    for (const p of proposals) {
      const { L, C1, C2 } = p.values;
      for (const v of [L, C1, C2]) expect(isPreferred(v, "E12"), String(v)).toBe(true);
      // The proposal's own frequency is the closed form with the lab's figure across the divider.
      expect(p.predictedHz / f0(L, series2(C1, C2) + labF) - 1).toBeCloseTo(0, 12);
      // Two E12 capacitors bracket any C_eff within a few %: the best pair lands within 5 % of the target.
      expect(Math.abs(p.errorPpm)).toBeLessThan(50_000);
      // The divider keeps near the C2/C1 = 2 asked (it sets the feedback fraction and the start-up gain).
      expect(C2 / C1).toBeGreaterThan(2 / 1.5);
      expect(C2 / C1).toBeLessThan(2 * 1.5);
    }
    // Ignoring the lab's figure would aim the bare model at the target and the board below it.
    const bare = proposeValues({ topology: "colpitts", targetHz, series: "E12", fixed: { L: proposals[0].values.L }, dividerRatio: 2 })[0];
    const bareAsBuiltHz = f0(bare.values.L, series2(bare.values.C1, bare.values.C2) + labF);
    expect(Math.abs(proposals[0].predictedHz - targetHz)).toBeLessThanOrEqual(Math.abs(bareAsBuiltHz - targetHz));
  });

  it("prefers_inductors_whose_reactance_is_nearest_the_one_asked", () => {
    const proposals = proposeValues({ topology: "tank", targetHz: 1.5915494e6, series: "E12", reactanceOhm: 100 });
    // Hand: 2π·1.5915494 MHz·10 µH = 100 Ω, and 10 µH is an E12 value.
    expect(proposals[0].values.L).toBeCloseTo(10e-6, 15);
    expect(proposals[0].reactanceOhm).toBeCloseTo(100, 4);
    // REFERENCES §1 row 8: L = 100 µH, C = 100 pF → 1.5915494 MHz, the same as 10 µH with 1 nF.
    expect(proposals[0].values.C).toBeCloseTo(1e-9, 20);
    expect(proposals[0].predictedHz / f0(10e-6, 1e-9) - 1).toBeCloseTo(0, 12);
  });

  it("trims_a_clapp_with_c3_and_keeps_the_divider_ten_times_larger", () => {
    const [p] = proposeValues({ topology: "clapp", targetHz: 5e6, series: "E24", fixed: { L: 10e-6 }, labCapacitanceF: 3 * pF });
    const { L, C1, C2, C3 } = p.values;
    expect(C1).toBeGreaterThan(5 * C3);
    const cEq = 1 / (1 / C1 + 1 / C2 + 1 / C3);
    expect(p.predictedHz / f0(L, cEq + 3 * pF) - 1).toBeCloseTo(0, 12);
    expect(Math.abs(p.errorPpm)).toBeLessThan(30_000);
  });

  it("keeps_a_hartley_coil_and_proposes_its_capacitor", () => {
    // REFERENCES §1 row 4: L1 = L2 = 1 mH, M = 0.5 mH, C = 10 nF → 29.057584 kHz; 10 nF is in E12.
    const [p] = proposeValues({ topology: "hartley", targetHz: 29.057584e3, series: "E12", fixed: { L1: 1e-3, L2: 1e-3, M: 0.5e-3 } });
    expect(p.values).toMatchObject({ L1: 1e-3, L2: 1e-3, M: 0.5e-3 });
    expect(p.values.C).toBeCloseTo(10e-9, 18);
    expect(Math.abs(p.errorPpm)).toBeLessThan(1);
  });

  it("refuses_bad_input_with_the_rule_named", () => {
    expect(() => proposeValues({ topology: "tank", targetHz: 0, series: "E12" })).toThrow(/positive frequency/);
    expect(() => proposeValues({ topology: "hartley", targetHz: 1e6, series: "E12" })).toThrow(/give L1 and L2/);
    expect(() => proposeValues({ topology: "colpitts", targetHz: 1e6, series: "E12", dividerRatio: -1 })).toThrow(/positive ratio/);
  });

  it("proposes_nothing_when_the_lab_s_figure_alone_exceeds_what_the_inductor_allows", () => {
    // 10 µH at 10 MHz needs C_eff 25.3 pF; a construction adding 40 pF leaves no room for a capacitor.
    expect(proposeValues({ topology: "tank", targetHz: 10e6, series: "E12", fixed: { L: 10e-6 }, labCapacitanceF: 40 * pF })).toEqual([]);
  });
});
