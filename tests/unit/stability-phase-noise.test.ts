/**
 * Phase noise and rms jitter from the phase residual, against closed forms (REFERENCES.md,
 * "Phase noise and jitter": 𝓛 = S_φ/2, φ_rms = √(2∫𝓛 df), σ_t = φ_rms/(2π f0), IEEE Std 2414-2020
 * terms [memory]; additive floor 𝓛 = 2σ²/(A²fs) derived from the even AM/PM split).
 */
import { describe, expect, it } from "vitest";
import { analyzeSamples } from "../../lib/analysis";
import { bandIntegral, demodulatePhase, residualDensities } from "../../lib/analysis/stability";
import { SeededRandom } from "../helpers/signals";
import { bandLimitedPhase, F0, FS, N, randomWalkPhase, toneWithPhase } from "./stability-signals";

const db = (x: number) => 10 * Math.log10(x);

function stabilityOf(y: Float64Array) {
  const { result } = analyzeSamples(y, FS, { plot: false });
  if (!result.stability) throw new Error("no stability figures");
  return { result, stability: result.stability };
}

/**
 * The curve against the truth over [lowHz, highHz], as the dB of the mean linear ratio (a mean of dB
 * values would be biased low by the chi-square skew of each band's estimate).
 */
function meanCurveErrorDb(curve: { offsetHz: number[]; dbcPerHz: number[] }, truthDb: (f: number) => number, lowHz: number, highHz: number): number {
  const ratios = curve.offsetHz.map((f, i) => [f, 10 ** ((curve.dbcPerHz[i] - truthDb(f)) / 10)]).filter(([f]) => f >= lowHz && f <= highHz).map(([, r]) => r);
  expect(ratios.length).toBeGreaterThan(5);
  return db(ratios.reduce((a, b) => a + b, 0) / ratios.length);
}

describe("phase noise of planted white PM", () => {
  // Flat S_φ = φ²/B up to B = 10 kHz (below the band's top, f0/4 ≈ 30.9 kHz), 𝓛 = φ²/(2B) = −93.5 dBc/Hz.
  const rms = 3e-3;
  const bandHz = 10e3;
  const noise = 1e-4;
  const random = new SeededRandom(1301);
  const y = toneWithPhase(bandLimitedPhase(N, FS, bandHz, rms, random), noise, random);
  const { stability } = stabilityOf(y);
  const truthDb = db((rms * rms) / (2 * bandHz));

  it("reads 𝓛(f) at the closed form across the planted band", () => {
    // Equal weight per tenth-decade band, so the lowest bands (ν ≈ 10–20) set the scatter: σ ≈ 0.3 dB
    // over seeds 1–8 of this set-up, and 1 dB is about 3σ.
    expect(Math.abs(meanCurveErrorDb(stability.phaseNoise.curve!, () => truthDb, 300, 8e3))).toBeLessThan(1);
    const at1k = stability.phaseNoise.points.find((p) => p.offsetHz === 1000)!;
    expect(at1k.atFloor).toBe(false);
    // One tenth-decade band near 1 kHz: ν ≈ 16, so 3σ of a χ² mean is about ±3 dB.
    expect(Math.abs(at1k.dbcPerHz - truthDb)).toBeLessThan(3);
  });

  it("states the additive floor at 2σ²/(A²·fs), far below the planted noise", () => {
    const floor = stability.phaseNoise.floor!;
    expect(Math.abs(floor.additiveDbcPerHz - db((2 * noise * noise) / FS))).toBeLessThan(0.5);
    expect(floor.additiveNoiseVrms).toBeCloseTo(noise, 5);
  });

  it("integrates to the planted rms phase, and σ_t = φ_rms/(2π f0)", () => {
    const { jitter } = stability;
    expect(jitter.atFloor).toBe(false);
    expect(jitter.bandLowHz).toBeCloseTo(FS / (N - (N % Math.round(FS / F0))), 6);
    expect(jitter.bandHighHz).toBeCloseTo(F0 / 4, 3);
    // All the planted noise lies in the band; the floor adds √(4σ²·30.9 kHz/fs) ≈ 1e-5 rad, nothing.
    // The Hann-weighted mean square of one record has ν ≈ 2BT/1.5 ≈ 700 dof: 3σ on the rms ≈ 8 %.
    expect(jitter.rmsPhaseRad! / rms).toBeGreaterThan(0.92);
    expect(jitter.rmsPhaseRad! / rms).toBeLessThan(1.08);
    expect((jitter.rmsJitterS! * 2 * Math.PI * F0) / jitter.rmsPhaseRad!).toBeCloseTo(1, 6);
  });

  it("uses one relation for the curve and the jitter: 2∫𝓛 df over its own curve gives the same rms", () => {
    const curve = stability.phaseNoise.curve!;
    const half = 10 ** 0.05;
    let integral = 0;
    curve.offsetHz.forEach((f, i) => {
      const lo = Math.max(stability.jitter.bandLowHz!, f / half);
      const hi = Math.min(stability.jitter.bandHighHz!, f * half);
      integral += 2 * 10 ** (curve.dbcPerHz[i] / 10) * (hi - lo);
    });
    // Band edges are approximate at the clipped ends; 5 % on the rms.
    expect(Math.sqrt(integral) / stability.jitter.rmsPhaseRad!).toBeGreaterThan(0.95);
    expect(Math.sqrt(integral) / stability.jitter.rmsPhaseRad!).toBeLessThan(1.05);
  });
});

describe("phase noise of planted white FM", () => {
  // A phase random walk of σ per sample: S_φ(f) = σ²·fs/(2π²f²), 𝓛 = σ²·fs/(4π²f²) (derived from h0 = 2σ²fs/(2πf0)², REFERENCES.md Allan).
  const step = 1e-3;
  const random = new SeededRandom(1302);
  const y = toneWithPhase(randomWalkPhase(N, step, random), 1e-4, random);
  const { stability } = stabilityOf(y);
  const truthDb = (f: number) => db((step * step * FS) / (4 * Math.PI ** 2 * f * f));

  it("follows the 1/f² closed form", () => {
    expect(Math.abs(meanCurveErrorDb(stability.phaseNoise.curve!, truthDb, 500, 20e3))).toBeLessThan(1);
    for (const p of stability.phaseNoise.points.filter((q) => q.dof >= 10)) {
      expect(p.atFloor).toBe(false);
      expect(Math.abs(p.dbcPerHz - truthDb(p.offsetHz))).toBeLessThan(10 * Math.log10(1 + 3 * Math.sqrt(2 / p.dof)) + 0.5);
    }
  });

  it("integrates 2∫𝓛 df over [10/T, f0/4] to the closed form σ²fs/(2π²)·(1/f1 − 1/f2)", () => {
    // The fit absorbs the offsets near 1/T (a red spectrum's integral rests there), so the check starts a decade up.
    const residual = demodulatePhase(y, { omegaRadPerSample: (2 * Math.PI * F0) / FS, amplitudeV: 1, phaseRad: 0.3, offsetV: 0 }, FS);
    const { pm } = residualDensities(residual, 1);
    const f1 = 10 / pm.durationS;
    const f2 = F0 / 4;
    const truth = ((step * step * FS) / (2 * Math.PI ** 2)) * (1 / f1 - 1 / f2);
    const measured = bandIntegral(pm, f1, f2).integral;
    expect(measured / truth).toBeGreaterThan(0.85);
    expect(measured / truth).toBeLessThan(1.15);
  });
});

describe("a clean tone", () => {
  const random = new SeededRandom(1303);
  const y = toneWithPhase(new Float64Array(N), 1e-3, random);
  const { stability } = stabilityOf(y);

  it("reports its jitter at the stated floor, not above", () => {
    const { jitter } = stability;
    expect(jitter.atFloor).toBe(true);
    expect(jitter.rmsPhaseRad).toBe(jitter.floorRmsPhaseRad);
    // The floor itself: 𝓛 = 2σ²/(A²fs) over the band, φ² = 4σ²(f2 − f1)/fs (derived).
    const expected = Math.sqrt((4 * 1e-6 * (jitter.bandHighHz! - jitter.bandLowHz!)) / FS);
    expect(jitter.floorRmsPhaseRad! / expected).toBeGreaterThan(0.95);
    expect(jitter.floorRmsPhaseRad! / expected).toBeLessThan(1.05);
  });

  it("marks every decade offset as at the floor", () => {
    expect(stability.phaseNoise.points.length).toBeGreaterThanOrEqual(3);
    for (const p of stability.phaseNoise.points) {
      expect(p.atFloor).toBe(true);
      expect(p.dbcPerHz).toBe(p.floorDbcPerHz);
    }
  });

  it("puts period jitter at its floor too", () => {
    expect(stability.periodJitter.atFloor).toBe(true);
    expect(stability.periodJitter.rmsPeriodJitterS).toBe(stability.periodJitter.floorRmsPeriodJitterS);
  });
});

describe("the quantization floor", () => {
  it("states q²/12 of an 8-bit record's code step and lifts the floor to it", () => {
    const random = new SeededRandom(1304);
    const step = 2 / 256;
    const clean = toneWithPhase(new Float64Array(N), 0, random, 0.9);
    // Dithered by a fraction of a code so the error is noise, then rounded to the grid.
    const y = clean.map((v) => Math.round((v + 0.3 * step * random.normal()) / step) * step);
    const { stability } = stabilityOf(y);
    const floor = stability.phaseNoise.floor!;
    expect(floor.quantizationStepV).toBeCloseTo(step, 12);
    // Against the fitted amplitude, which the dither and rounding move by parts in 10⁵.
    expect(floor.quantizationDbcPerHz).toBeCloseTo(db((2 * (step * step) / 12) / (0.9 * 0.9 * FS)), 2);
    expect(floor.dbcPerHz).toBeGreaterThanOrEqual(floor.quantizationDbcPerHz!);
    expect(stability.jitter.atFloor).toBe(true);
  });
});

describe("a spur in the floor's band", () => {
  it("does not lift the floor (the white level is a median)", () => {
    const random = new SeededRandom(1305);
    const noise = 1e-3;
    const y = toneWithPhase(new Float64Array(N), noise, random);
    // −60 dBc at 1.2·f0: 0.2·f0 from the carrier, inside [f0/8, f0/4] where the floor is read.
    for (let n = 0; n < N; n++) y[n] += 1e-3 * Math.cos((2 * Math.PI * 1.2 * F0 * n) / FS);
    const { stability } = stabilityOf(y);
    expect(Math.abs(stability.phaseNoise.floor!.additiveDbcPerHz - db((2 * noise * noise) / FS))).toBeLessThan(0.5);
  });
});

