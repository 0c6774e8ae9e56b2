/**
 * Allan deviation within the record against the power-law forms (IEEE Std 1139-2008; NIST SP 1065,
 * W. J. Riley 2008, power-law table [memory]; REFERENCES.md "Allan deviation").
 */
import { describe, expect, it } from "vitest";
import { analyzeSamples } from "../../lib/analysis";
import { chiSquareQuantile, overlappingAllan, whiteFmEdf } from "../../lib/analysis/stability";
import { SeededRandom } from "../helpers/signals";
import { bandLimitedPhase, F0, FS, N, randomWalkPhase, toneWithPhase } from "./stability-signals";

function allanOf(y: Float64Array) {
  const { result } = analyzeSamples(y, FS, { plot: false });
  return result.stability!.allan;
}

/** Weighted slope of log σ_y against log τ. */
function logLogSlope(points: { tauS: number; adev: number; edf: number }[]): number {
  let sw = 0, sx = 0, sy = 0, sxx = 0, sxy = 0;
  for (const p of points) {
    const w = p.edf;
    const x = Math.log(p.tauS);
    const y = Math.log(p.adev);
    sw += w;
    sx += w * x;
    sy += w * y;
    sxx += w * x * x;
    sxy += w * x * y;
  }
  return (sw * sxy - sx * sy) / (sw * sxx - sx * sx);
}

describe("overlapping Allan deviation of white FM", () => {
  // Phase steps of σ rad per sample: σ_y(τ0) = σ/(2πf0τ0) at τ0 = 1/fs and σ_y(τ) = √(h0/(2τ)) with
  // h0 = 2σ_y(τ0)²τ0, i.e. σ_y(τ0)·√(τ0/τ) (NIST SP 1065 white FM row; REFERENCES.md [computed]).
  const step = 1e-3;
  const random = new SeededRandom(1139);
  const allan = allanOf(toneWithPhase(randomWalkPhase(N, step, random), 1e-4, random));
  const tau0 = 1 / FS;
  const h0 = 2 * (step / (2 * Math.PI * F0 * tau0)) ** 2 * tau0;
  const truth = (tauS: number) => Math.sqrt(h0 / (2 * tauS));

  it("covers octaves from 8 periods to a quarter of the record", () => {
    expect(allan.reason).toBeNull();
    expect(allan.points.length).toBeGreaterThanOrEqual(7);
    expect(allan.points[0].tauS).toBeCloseTo(8 * Math.round(FS / F0) / FS, 12);
    for (const p of allan.points) expect(p.lowerAdev).toBeLessThan(p.adev);
    for (const p of allan.points) expect(p.upperAdev).toBeGreaterThan(p.adev);
  });

  it("matches √(h0/(2τ)) within its stated interval", () => {
    for (const p of allan.points) {
      // The one-period phase average biases σ_y low by under 3 % from 8 periods on (derived:
      // √(1 − 1/(2m))); allow 2.5 of the 1σ half-widths beside it.
      const halfWidth = Math.log(p.upperAdev / p.adev);
      expect(Math.abs(Math.log(p.adev / truth(p.tauS)))).toBeLessThan(2.5 * halfWidth + 0.035);
    }
  });

  it("falls as τ^−½", () => {
    expect(logLogSlope(allan.points)).toBeCloseTo(-0.5, 1);
  });

  it("stands clear of the additive-noise floor", () => {
    for (const p of allan.points) expect(p.atFloor).toBe(false);
  });
});

describe("the Allan floor of a clean tone", () => {
  it("puts every τ at the floor √3·σ_x/τ that its additive noise sets, and the deviation near it", () => {
    const random = new SeededRandom(1142);
    const allan = allanOf(toneWithPhase(new Float64Array(N), 1e-3, random));
    expect(allan.points.length).toBeGreaterThan(5);
    for (const p of allan.points) {
      expect(p.atFloor).toBe(true);
      // Independent block phases: the deviation scatters about the floor within its interval.
      expect(p.adev / p.floorAdev).toBeGreaterThan(0.8);
      expect(p.adev / p.floorAdev).toBeLessThan(1.2);
    }
  });
});

describe("overlapping Allan deviation of white PM", () => {
  // Band-limited white phase (flat to 10 kHz) averaged per block is nearly white at τ ≥ 8 periods:
  // σ_y ∝ τ^−1 (NIST SP 1065 white PM row).
  const random = new SeededRandom(1140);
  const allan = allanOf(toneWithPhase(bandLimitedPhase(N, FS, 20e3, 2e-3, random), 1e-4, random));

  it("falls as τ^−1", () => {
    expect(logLogSlope(allan.points)).toBeGreaterThan(-1.1);
    expect(logLogSlope(allan.points)).toBeLessThan(-0.9);
  });
});

describe("overlappingAllan on phase data", () => {
  it("gives √3·σ_x/τ for independent phase-time samples (derived: E(Δ²x)² = 6σ_x²)", () => {
    const random = new SeededRandom(1141);
    const x = Float64Array.from({ length: 40_000 }, () => 1e-9 * random.normal());
    const points = overlappingAllan(x, 1e-6, 1);
    for (const p of points.filter((q) => q.tauS <= 64e-6)) {
      expect(p.adev / ((Math.sqrt(3) * 1e-9) / p.tauS)).toBeGreaterThan(0.95);
      expect(p.adev / ((Math.sqrt(3) * 1e-9) / p.tauS)).toBeLessThan(1.05);
    }
  });

  it("gives zero for a pure frequency offset (a line of phase)", () => {
    const x = Float64Array.from({ length: 1000 }, (_, i) => 1e-9 * i);
    for (const p of overlappingAllan(x, 1e-6, 1)) expect(p.adev).toBeLessThan(1e-12);
  });
});

describe("confidence helpers", () => {
  it("Wilson–Hilferty χ² quantiles agree with tables (χ²₀.₉₇₅(10) = 20.483, χ²₀.₀₂₅(10) = 3.247, textbook tables)", () => {
    expect(chiSquareQuantile(10, 1.959964)).toBeCloseTo(20.483, 0);
    expect(chiSquareQuantile(10, -1.959964) / 3.247).toBeGreaterThan(0.97);
    expect(chiSquareQuantile(10, -1.959964) / 3.247).toBeLessThan(1.03);
  });

  it("white-FM edf shrinks as τ grows and is about 3(N−1)/(2m) for m ≫ 1", () => {
    expect(whiteFmEdf(10_000, 8)).toBeGreaterThan(whiteFmEdf(10_000, 16));
    expect(whiteFmEdf(10_000, 64) / ((3 * 9999) / 128 - 2)).toBeCloseTo(1, 3);
  });
});
