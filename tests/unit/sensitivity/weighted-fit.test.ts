import { describe, expect, it } from "vitest";
import { chiSquareSurvival, logGamma } from "@/lib/sensitivity/chi-square";
import { weightedLinearFit } from "@/lib/sensitivity/weighted-fit";

// The straight-line closed forms (Bevington & Robinson, "Data Reduction and Error Analysis for the Physical
// Sciences", ch. 6, from memory), worked by hand for five points with σ = 1, 2, 1, 2, 1 (w = 1, ¼, 1, ¼, 1):
//   S = 3.5, Sx = 38.5, Sy = 315.4, Sxx = 432, Sxy = 3427.4, Δ = S·Sxx − Sx² = 29.75
//   slope b = (S·Sxy − Sx·Sy)/Δ = −147/29.75 = −4.94117647…, intercept a = (Sxx·Sy − Sx·Sxy)/Δ = 144.46722689…
//   σ_b = √(S/Δ) = 0.34299717, σ_a = √(Sxx/Δ) = 3.81064409, χ² = Σ((y − a − b·x)/σ)² = 0.04487395
const x = [9, 10, 11, 12, 13];
const y = [100.0, 95.2, 90.1, 84.8, 80.3];
const sigma = [1, 2, 1, 2, 1];

describe("weightedLinearFit", () => {
  it("matches the hand-worked closed form for slope, intercept, their σ and χ²", () => {
    const fit = weightedLinearFit(x.map((xi, i) => ({ y: y[i], sigma: sigma[i], x: [xi] })));
    expect(fit.coefficients[1]).toBeCloseTo(-147 / 29.75, 10);
    expect(fit.coefficients[0]).toBeCloseTo(144.4672268907561, 9);
    expect(fit.sigmas[1]).toBeCloseTo(0.3429971702850177, 10);
    expect(fit.sigmas[0]).toBeCloseTo(3.8106440929797345, 9);
    expect(fit.chiSquare).toBeCloseTo(0.04487394957983112, 10);
    expect(fit.degreesOfFreedom).toBe(3);
    expect(fit.reducedChiSquare).toBeCloseTo(0.04487394957983112 / 3, 10);
  });

  it("weights: a point with a larger σ pulls the line less (equal σ would give another slope)", () => {
    const unweighted = weightedLinearFit(x.map((xi, i) => ({ y: y[i], sigma: 1, x: [xi] })));
    // Plain least squares: slope = Σ(x−x̄)(y−ȳ)/Σ(x−x̄)² = −49.8/10.
    expect(unweighted.coefficients[1]).toBeCloseTo(-4.98, 10);
    expect(unweighted.coefficients[1]).not.toBeCloseTo(-147 / 29.75, 3);
  });

  it("recovers an exact plane in two regressors with χ² = 0", () => {
    const pts = [
      [0, 0],
      [1, 0],
      [0, 1],
      [1, 1],
      [2, 3],
    ].map(([a, b]) => ({ y: 5 + 2 * a - 3 * b, sigma: 0.5, x: [a, b] }));
    const fit = weightedLinearFit(pts);
    expect(fit.coefficients[0]).toBeCloseTo(5, 10);
    expect(fit.coefficients[1]).toBeCloseTo(2, 10);
    expect(fit.coefficients[2]).toBeCloseTo(-3, 10);
    expect(fit.chiSquare).toBeCloseTo(0, 18);
  });

  it("refuses regressors with no spread, too few points and a σ that is not above 0", () => {
    expect(() => weightedLinearFit([1, 2, 3].map((v) => ({ y: v, sigma: 1, x: [4] })))).toThrow(/no spread/);
    expect(() => weightedLinearFit([{ y: 1, sigma: 1, x: [1] }])).toThrow(/at least 2 points/);
    expect(() => weightedLinearFit([{ y: 1, sigma: 0, x: [1] }, { y: 2, sigma: 1, x: [2] }])).toThrow(/sigma/);
  });
});

describe("chiSquareSurvival", () => {
  // Check values computed with SciPy 1.x scipy.stats.chi2.sf.
  it.each([
    [3.841458820694124, 1, 0.05],
    [10, 4, 0.04042768199451279],
    [30, 10, 0.000856641210775301],
    [0.5, 3, 0.9188914116546758],
  ])("Q(%f | %i) = %f", (chi, dof, expected) => {
    expect(chiSquareSurvival(chi, dof)).toBeCloseTo(expected, 9);
  });

  it("is 1 at χ² = 0 and logGamma matches ln((n−1)!)", () => {
    expect(chiSquareSurvival(0, 3)).toBe(1);
    expect(logGamma(6)).toBeCloseTo(Math.log(120), 12);
    expect(logGamma(0.5)).toBeCloseTo(Math.log(Math.sqrt(Math.PI)), 12);
  });
});
