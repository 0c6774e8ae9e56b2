import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  frequencySensitivities,
  predictOscillator,
  rssBand,
  seededRandom,
  statisticalBand,
  worstCaseBand,
  type OscillatorDesign,
  type Topology,
} from "@/lib/oscillator";
import { design, expectAbs, expectRel } from "./expect-close";

describe("worstCaseBand", () => {
  it("matches a ±5 % capacitor on a 100 µH / 100 pF tank", () => {
    // REFERENCES.md §1 row 8 (IIT(ISM) NPHC206 tutorial inputs) [computed]: C +5 % → −2.4100 %, C −5 % → +2.5978 %.
    const d = design("tank", { L: 100e-6, C: 100e-12 }, { C: 0.05 });
    const band = worstCaseBand(d);
    const f0 = predictOscillator(d).predictedHz;
    expectRel(f0, 1.5915494e6, 1e-6);
    expectAbs((band.minHz / f0 - 1) * 100, -2.41, 1e-4);
    expectAbs((band.maxHz / f0 - 1) * 100, 2.5978, 1e-4);
    expect(band.corners).toBe(2);
    expectRel(band.minCorner.C, 105e-12, 1e-12);
  });

  it("is the nominal alone without tolerances", () => {
    const d = design("colpitts", { L: 1e-4, C1: 1e-9, C2: 4.7e-9 });
    const band = worstCaseBand(d);
    expect(band.minHz).toBe(predictOscillator(d).predictedHz);
    expect(band.maxHz).toBe(band.minHz);
    expect(band.corners).toBe(1);
  });
});

const arbitraryDesign = fc
  .record({
    topology: fc.constantFrom<Topology>("tank", "colpitts", "clapp", "hartley"),
    // Within the bench limits (lib/oscillator/limits.ts): 1 nH … 10 H, 0.1 pF … 10 mF, β from 10⁻³ to 10³.
    base: fc.double({ min: 1e-9, max: 1e-5, noNaN: true }),
    scales: fc.array(fc.double({ min: 1, max: 1e3, noNaN: true }), { minLength: 4, maxLength: 4 }),
    tolerances: fc.array(fc.double({ min: 0, max: 0.3, noNaN: true }), { minLength: 5, maxLength: 5 }),
    k: fc.double({ min: 0, max: 0.9, noNaN: true }),
  })
  .map(({ topology, base, scales, tolerances, k }): OscillatorDesign => {
    const refs = { tank: ["L", "C"], colpitts: ["L", "C1", "C2"], clapp: ["L", "C1", "C2", "C3"], hartley: ["L1", "L2", "C"] }[topology];
    const values: Record<string, number> = {};
    const tol: Record<string, number> = {};
    refs.forEach((ref, i) => {
      values[ref] = base * scales[i];
      tol[ref] = tolerances[i];
    });
    if (topology === "hartley") {
      values.k = k;
      tol.k = tolerances[4];
    }
    return design(topology, values, tol);
  });

describe("worstCaseBand properties", () => {
  it("always contains the nominal prediction, and the statistical band lies inside it", () => {
    fc.assert(
      fc.property(arbitraryDesign, (d) => {
        const f0 = predictOscillator(d).predictedHz;
        const worst = worstCaseBand(d);
        expect(worst.minHz).toBeLessThanOrEqual(f0);
        expect(worst.maxHz).toBeGreaterThanOrEqual(f0);
        const stat = statisticalBand(d, { trials: 500, seed: 9 });
        expect(stat.minHz).toBeGreaterThanOrEqual(worst.minHz * (1 - 1e-12));
        expect(stat.maxHz).toBeLessThanOrEqual(worst.maxHz * (1 + 1e-12));
      }),
      { seed: 5, numRuns: 200 },
    );
  });
});

describe("statisticalBand", () => {
  const d = design("colpitts", { L: 100e-6, C1: 1e-9, C2: 4.7e-9 }, { L: 0.1, C1: 0.05, C2: 0.05 });

  it("is deterministic for a seed", () => {
    expect(statisticalBand(d, { seed: 42 })).toEqual(statisticalBand(d, { seed: 42 }));
    expect(statisticalBand(d, { seed: 42 }).minHz).not.toBe(statisticalBand(d, { seed: 43 }).minHz);
  });

  it("agrees with the RSS band for small tolerances", () => {
    // For ±1 % parts the linear RSS and the Monte Carlo 99.7 % band should agree to a few percent of their width;
    // truncation at ±3σ makes the Monte Carlo band slightly narrower.
    const small = design("tank", { L: 10e-6, C: 1e-9 }, { L: 0.01, C: 0.01 });
    const f0 = predictOscillator(small).predictedHz;
    const mc = statisticalBand(small, { seed: 1, trials: 50_000 });
    const rss = rssBand(small);
    const mcHalf = (mc.maxHz - mc.minHz) / 2;
    const rssHalf = (rss.maxHz - rss.minHz) / 2;
    expectRel(mcHalf, rssHalf, 0.06);
    expect(mc.minHz).toBeLessThan(f0);
    expect(mc.maxHz).toBeGreaterThan(f0);
    expect(mc.method).toBe("monte-carlo");
    expect(mc.coverage).toBe(0.997);
  });

  it("refuses bad options", () => {
    expect(() => statisticalBand(d, { trials: 10 })).toThrow(/trials/);
    expect(() => statisticalBand(d, { coverage: 1 })).toThrow(/coverage/);
  });
});

describe("rssBand", () => {
  it("is ±½·tolerance for one tank part taken as 3σ", () => {
    // df/f = −½·dC/C (REFERENCES.md §1, derived); 3σ = 5 % on C gives ±2.5 % on f.
    const d = design("tank", { L: 100e-6, C: 100e-12 }, { C: 0.05 });
    const f0 = predictOscillator(d).predictedHz;
    const band = rssBand(d);
    expectRel(band.relativeSigma, 0.025 / 3, 1e-8);
    expectRel(band.maxHz, f0 * 1.025, 1e-9);
  });
});

describe("frequencySensitivities", () => {
  it("is −½ for L and C of a tank and splits by the divider in a Colpitts", () => {
    // REFERENCES.md §1 (derived): df/f = −½(dL/L + dC/C); ∂ln C_eff/∂ln C1 = C2/(C1+C2) for two in series.
    const tank = frequencySensitivities(design("tank", { L: 1e-4, C: 1e-10 }));
    expectAbs(tank.L, -0.5, 1e-9);
    expectAbs(tank.C, -0.5, 1e-9);
    const colpitts = frequencySensitivities(design("colpitts", { L: 1e-4, C1: 1e-9, C2: 4e-9 }));
    expectAbs(colpitts.C1, -0.5 * (4 / 5), 1e-9);
    expectAbs(colpitts.C2, -0.5 * (1 / 5), 1e-9);
  });
});

describe("seededRandom", () => {
  it("repeats for a seed and stays in [0, 1)", () => {
    const a = seededRandom(7);
    const b = seededRandom(7);
    for (let i = 0; i < 1000; i++) {
      const x = a();
      expect(x).toBe(b());
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x).toBeLessThan(1);
    }
  });
});
