/**
 * Period and cycle-to-cycle jitter from zero crossings (IEEE Std 2414-2020 terms [memory]). With
 * rising crossings at t_i = i·T0 + e_i, e_i independent N(0, σ²): periods e_{i+1} − e_i have rms √2·σ
 * and adjacent-period differences e_{i+2} − 2e_{i+1} + e_i have rms √6·σ (derived).
 */
import { describe, expect, it } from "vitest";
import { analyzeSamples } from "../../lib/analysis";
import { periodJitter, risingCrossings } from "../../lib/analysis/stability";
import { SeededRandom } from "../helpers/signals";
import { F0, FS, N, toneWithPhase } from "./stability-signals";

/**
 * A sine whose rising zero crossings are displaced by planted Gaussian timing errors: the phase is
 * warped piecewise linearly between crossing nodes, so crossing i sits at i·T0 + e_i exactly.
 */
function jitteredSine(samples: number, timingRmsS: number, noiseVrms: number, random: SeededRandom): Float64Array {
  const period = 1 / F0;
  const nodes = Math.ceil(samples / FS / period) + 2;
  const e = Float64Array.from({ length: nodes }, () => timingRmsS * random.normal());
  const y = new Float64Array(samples);
  let i = 0;
  for (let n = 0; n < samples; n++) {
    const t = n / FS;
    while (i + 1 < nodes && t >= (i + 1) * period + e[i + 1]) i++;
    const start = i * period + e[i];
    const end = (i + 1) * period + e[i + 1];
    const phase = 2 * Math.PI * (i + (t - start) / (end - start));
    // Rising zero crossing of sin at phase 0 of each cycle.
    y[n] = Math.sin(phase) + noiseVrms * random.normal();
  }
  return y;
}

describe("period jitter of planted Gaussian timing jitter", () => {
  const sigma = 2e-9;
  const random = new SeededRandom(2414);
  const { result } = analyzeSamples(jitteredSine(N, sigma, 1e-4, random), FS, { plot: false });
  const pj = result.stability!.periodJitter;

  it("recovers √2·σ as the rms period jitter and √6·σ as the cycle-to-cycle jitter", () => {
    expect(pj.reason).toBeNull();
    expect(pj.atFloor).toBe(false);
    // ~6400 periods: the rms of a Gaussian is known to 1/√(2·6400) ≈ 0.9 %; 4 % covers that and the
    // additive noise's √(floor²) share (floor ≈ 0.12 ns against 2.8 ns).
    expect(pj.rmsPeriodJitterS! / (Math.SQRT2 * sigma)).toBeGreaterThan(0.96);
    expect(pj.rmsPeriodJitterS! / (Math.SQRT2 * sigma)).toBeLessThan(1.04);
    expect(pj.rmsCycleToCycleS! / (Math.sqrt(6) * sigma)).toBeGreaterThan(0.96);
    expect(pj.rmsCycleToCycleS! / (Math.sqrt(6) * sigma)).toBeLessThan(1.04);
    expect(pj.rmsPeriodJitterFraction! / (pj.rmsPeriodJitterS! * F0)).toBeCloseTo(1, 4);
    expect(pj.meanPeriodS! * F0).toBeCloseTo(1, 6);
  });
});

describe("the period-jitter floor", () => {
  it("matches what additive noise alone does to the crossings: √2·√(2/3)·σ/(A·ω) (derived)", () => {
    const random = new SeededRandom(2415);
    const noise = 3e-3;
    // 80.37 samples a period, so the crossings visit every position between samples: the 2/3 is an
    // average over them (at a whole number of samples a period every crossing sits at one position).
    const f = FS / 80.37;
    const y = toneWithPhase(new Float64Array(N), noise, random, 1, f);
    const omega = (2 * Math.PI * f) / FS;
    // The raw rms, from the crossings themselves (the result reports the floor once at it).
    const crossings = risingCrossings(y, omega, 0, 4 * noise);
    const periods = Array.from(crossings.subarray(1), (c, i) => (c - crossings[i]) / FS);
    const mean = periods.reduce((a, b) => a + b, 0) / periods.length;
    const raw = Math.sqrt(periods.reduce((a, p) => a + (p - mean) ** 2, 0) / (periods.length - 1));
    const expected = (Math.SQRT2 * Math.sqrt(2 / 3) * (noise / omega)) / FS;
    expect(raw / expected).toBeGreaterThan(0.95);
    expect(raw / expected).toBeLessThan(1.05);
    const withFloor = periodJitter(y, FS, omega, 1, 0, noise);
    // Summed from each crossing's own position, which visit [0, 1) evenly here: the average 2/3 to a percent.
    expect(withFloor.floorRmsPeriodJitterS! / expected).toBeCloseTo(1, 2);
    expect(withFloor.atFloor).toBe(true);
  });

  it("follows the crossing position when every crossing sits at the same one (81.0000 samples a period)", () => {
    const random = new SeededRandom(2417);
    const noise = 3e-3;
    const y = toneWithPhase(new Float64Array(N), noise, random);
    const omega = (2 * Math.PI * F0) / FS;
    const crossings = risingCrossings(y, omega, 0, 4 * noise);
    const periods = Array.from(crossings.subarray(1), (c, i) => (c - crossings[i]) / FS);
    const mean = periods.reduce((a, b) => a + b, 0) / periods.length;
    const raw = Math.sqrt(periods.reduce((a, p) => a + (p - mean) ** 2, 0) / (periods.length - 1));
    const pj = periodJitter(y, FS, omega, 1, 0, noise);
    expect(raw / pj.floorRmsPeriodJitterS!).toBeGreaterThan(0.95);
    expect(raw / pj.floorRmsPeriodJitterS!).toBeLessThan(1.05);
    expect(pj.atFloor).toBe(true);
  });

  it("says why when the record holds too few periods", () => {
    const y = toneWithPhase(new Float64Array(600), 1e-4, new SeededRandom(2416));
    const pj = periodJitter(y, FS, (2 * Math.PI * F0) / FS, 1, 0, 1e-4);
    expect(pj.rmsPeriodJitterS).toBeNull();
    expect(pj.reason).toMatch(/at least 16/);
  });
});
