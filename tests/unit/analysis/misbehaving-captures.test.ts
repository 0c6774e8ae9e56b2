/**
 * The captures a misbehaving oscillator produces: each is measured right or carries a warning that
 * names the problem. Signals are synthesized with planted truth; where an estimate is compared, it
 * is against an independent four-parameter least-squares fit in the test helpers (IEEE Std 1057
 * §4.1.3.3) or a closed form.
 */
import { describe, expect, it } from "vitest";
import { analyzeSamples } from "@/lib/analysis";
import { noisyTone, referenceSineFit, SeededRandom, whiteFmTone } from "../../helpers/signals";

const codes = (y: Float64Array, fs: number, harmonics = 10) => analyzeSamples(y, fs, { harmonics }).result.warnings.map((w) => w.code);

describe("records of few periods", () => {
  // 40 dB SNR: noise σ = A/√2 · 10^(−40/20).
  const sigma = (1 / Math.SQRT2) * 0.01;

  it.each([
    { periods: 1.5, bound: 5e-3 },
    { periods: 2.02, bound: 2e-3 },
    { periods: 3.4, bound: 1e-3 },
    { periods: 5.3, bound: 1e-3 },
  ])("$periods periods in 2000 samples at 40 dB SNR: within $bound relative over 12 seeds, and a few-cycles warning", ({ periods, bound }) => {
    const fs = 1e6;
    const n = 2000;
    for (let seed = 1; seed <= 12; seed++) {
      const random = new SeededRandom(seed);
      const y = noisyTone(n, periods / n, 1, 0.7 * seed, sigma, random, 0.05);
      const { result } = analyzeSamples(y, fs);
      const trueHz = (periods / n) * fs;
      expect(Math.abs(result.frequencyHz / trueHz - 1)).toBeLessThan(bound);
      expect(result.warnings.map((w) => w.code)).toContain("few-cycles");
      expect(result.cycles).toBeCloseTo(periods, 1);
    }
  });

  it("agrees with an independent four-parameter least-squares fit at 2 periods to 1e-4 relative", () => {
    const n = 2000;
    const y = noisyTone(n, 2.02 / n, 1, 1.1, sigma, new SeededRandom(42), -0.2);
    const engine = analyzeSamples(y, 1e6).result;
    const reference = referenceSineFit(y, 0.6, 12);
    expect(Math.abs(engine.frequencyHz / (reference.cyclesPerSample * 1e6) - 1)).toBeLessThan(1e-4);
  });
});

describe("harmonics above half the sample rate", () => {
  it("fits a 4th harmonic folded from 0.524 fs to 0.476 fs at its planted −25 dBc, so THD is −25 dB, not −38.8", () => {
    const n = 20000;
    const random = new SeededRandom(3);
    const y = new Float64Array(n);
    const h4 = 10 ** (-25 / 20);
    for (let i = 0; i < n; i++) {
      y[i] = Math.cos(2 * Math.PI * 0.131 * i) + h4 * Math.cos(2 * Math.PI * 4 * 0.131 * i + 0.4) + 0.001 * random.normal();
    }
    const { result } = analyzeSamples(y, 1e6);
    const fourth = result.harmonics.find((h) => h.order === 4);
    expect(fourth).toMatchObject({ folded: true, status: "measured" });
    expect(fourth?.seenAtHz).toBeCloseTo((1 - 4 * 0.131) * 1e6, 0);
    expect(fourth?.dBc).toBeCloseTo(-25, 1);
    expect(result.thdDb).toBeCloseTo(-25, 1);
    expect(result.largestSpur?.label).toBe("harmonic 4 (folded)");
  });

  it("reports THD as not measurable, never 0, when an order folds onto the fundamental; advises the sample rate", () => {
    // f = fs/4: harmonic 3 folds onto the fundamental, 2 onto Nyquist, 4 onto DC.
    const n = 4096;
    const y = noisyTone(n, 0.25, 1, 0.3, 0.001, new SeededRandom(9));
    const { result } = analyzeSamples(y, 4e6);
    expect(result.thdPercent).toBeNull();
    expect(result.thd.status).toBe("not-measurable");
    expect(result.harmonics.find((h) => h.order === 3)).toMatchObject({ status: "not-separable", dBc: null });
    // 2 × 10 × 1 MHz = 20 MS/s puts harmonic 10 on Nyquist; 5 % to spare gives 21 MS/s.
    expect(result.thd.neededSampleRateHz).toBeCloseTo(21e6, 0);
    expect(result.thd.note).toContain("sample at ≥ 21 MS/s to see harmonics up to 10");
  });
});

describe("detection limits", () => {
  it("a pure tone at 40 dB SNR has no harmonic above the noise: each reads '< limit', THD only its floor", () => {
    const n = 10000;
    const sigma = (1 / Math.SQRT2) * 0.01;
    const { result } = analyzeSamples(noisyTone(n, 0.01234, 1, 0, sigma, new SeededRandom(5)), 1e6);
    expect(result.harmonics.every((h) => h.status === "below-detection" && h.dBc === null)).toBe(true);
    // Limit 4·σ·√(2/N) over A = 1: 20·log10(4 · 0.00707 · 0.01414) = −68.0 dBc.
    for (const h of result.harmonics) expect(h.detectionLimitDbc as number).toBeCloseTo(-68.0, 0);
    expect(result.thdPercent).toBeNull();
    expect(result.thd.status).toBe("below-floor");
    expect(result.thd.floorPercent).toBeGreaterThan(0.1);
  });

  it("a harmonic well above the noise is measured; THD counts it and states the floor of the rest", () => {
    const n = 10000;
    const random = new SeededRandom(6);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) y[i] = Math.cos(2 * Math.PI * 0.01234 * i) + 0.01 * Math.cos(2 * Math.PI * 3 * 0.01234 * i) + 0.001 * random.normal();
    const { result } = analyzeSamples(y, 1e6);
    expect(result.thd.detectedOrders).toEqual([3]);
    expect(result.thdPercent).toBeCloseTo(1, 2);
    expect(result.thd.upperBoundPercent as number).toBeGreaterThan(result.thdPercent as number);
  });
});

describe("second modes, sub-harmonics and noise", () => {
  const n = 20000;
  const fs = 1e6;

  it("two non-harmonic tones 1.6 dB apart: the stronger is the fundamental, and a second-mode warning names the other", () => {
    const random = new SeededRandom(11);
    const y = new Float64Array(n);
    const weaker = 10 ** (-1.6 / 20);
    for (let i = 0; i < n; i++) y[i] = Math.cos(2 * Math.PI * 0.0213 * i) + weaker * Math.cos(2 * Math.PI * 0.0371 * i + 1) + 0.001 * random.normal();
    const { result } = analyzeSamples(y, fs);
    expect(result.frequencyHz).toBeCloseTo(0.0213 * fs, 0);
    const mode = result.spurs.find((s) => s.kind === "second-mode");
    expect(mode?.frequencyHz).toBeCloseTo(0.0371 * fs, -2);
    expect(mode?.dBc).toBeCloseTo(-1.6, 0);
    expect(result.warnings.map((w) => w.code)).toContain("second-mode");
  });

  it("a sub-harmonic at f/2, −18 dBc (period doubling) is named and warned about", () => {
    const random = new SeededRandom(12);
    const y = new Float64Array(n);
    const f = 0.0413;
    for (let i = 0; i < n; i++) y[i] = Math.cos(2 * Math.PI * f * i) + 10 ** (-18 / 20) * Math.cos(Math.PI * f * i + 0.3) + 0.002 * random.normal();
    const { result } = analyzeSamples(y, fs);
    const sub = result.spurs.find((s) => s.kind === "sub-harmonic");
    expect(sub?.label).toBe("f/2");
    expect(sub?.dBc).toBeCloseTo(-18, 0);
    expect(result.warnings.map((w) => w.code)).toContain("sub-harmonic");
  });

  it("white noise with no tone: a no-dominant-tone warning, not a confident frequency", () => {
    for (let seed = 1; seed <= 5; seed++) {
      const random = new SeededRandom(seed);
      const y = Float64Array.from({ length: n }, () => random.normal());
      const { result } = analyzeSamples(y, fs);
      expect(result.tone.detected).toBe(false);
      expect(result.warnings.map((w) => w.code)).toContain("no-dominant-tone");
    }
  });

  it("a second mode five bins from the second harmonic's place, −6 dBc, is found, though the fit finds that harmonic under the noise", () => {
    // The spur search used to leave out a harmonic's whole lobe: this tone was hidden, and SFDR read 16 dB.
    const random = new SeededRandom(14);
    const f = 0.0123456;
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) y[i] = Math.sin(2 * Math.PI * f * i) + 0.5 * Math.sin(2 * Math.PI * 2.02 * f * i) + 0.001 * random.normal();
    const { result } = analyzeSamples(y, fs);
    expect(result.harmonics.find((h) => h.order === 2)?.status).toBe("below-detection");
    const mode = result.spurs.find((s) => s.kind === "second-mode");
    expect(mode?.frequencyHz).toBeCloseTo(2.02 * f * fs, -1);
    // 20·log10(0.5) = −6.02 dB.
    expect(mode?.dBc).toBeCloseTo(-6.02, 0);
    expect(result.sfdrDb).toBeCloseTo(6.02, 0);
    expect(result.warnings.map((w) => w.code)).toContain("second-mode");
  });

  it("a second mode 3 dB down leaves jitter, phase noise, period jitter and Allan deviation not measured, naming it", () => {
    const random = new SeededRandom(15);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) y[i] = Math.sin(2 * Math.PI * 0.0123456 * i) + 0.7 * Math.sin(2 * Math.PI * 0.0169135 * i) + 0.001 * random.normal();
    const stability = analyzeSamples(y, fs).result.stability;
    if (!stability) throw new Error("no stability block");
    for (const part of [stability.jitter, stability.phaseNoise, stability.periodJitter, stability.allan]) {
      expect(part.reason).toMatch(/^a second mode at 16\.91 kHz, only 3\.1 dB below the fundamental/);
    }
    expect(stability.jitter.rmsJitterS).toBeNull();
    expect(stability.allan.points).toEqual([]);
  });

  it("a square wave's harmonics above the orders asked for are harmonics, not a second mode", () => {
    // Square wave: harmonic h (odd) at 1/h of the fundamental (Fourier series, closed form), so the 3rd is −9.54 dBc.
    const random = new SeededRandom(16);
    const f = 0.0123456;
    const y = Float64Array.from({ length: n }, (_, i) => (Math.sin(2 * Math.PI * f * i) >= 0 ? 1 : -1) + 0.001 * random.normal());
    const { result } = analyzeSamples(y, fs, { harmonics: 2 });
    expect(result.spurs.map((s) => s.kind)).not.toContain("second-mode");
    expect(result.warnings.map((w) => w.code)).not.toContain("second-mode");
    expect(result.spurs[0]).toMatchObject({ kind: "harmonic", label: "harmonic 3 (beyond order 2)" });
    expect(result.spurs[0].dBc).toBeCloseTo(-9.54, 0);
    expect(result.spurs.map((s) => s.label)).toContain("harmonic 5 (beyond order 2)");
    expect(result.sfdrDb).toBeCloseTo(9.54, 0);
  });

  it("mains hum is named as such and raises no warning", () => {
    const random = new SeededRandom(13);
    const m = 200000;
    const rate = 100e3;
    const y = new Float64Array(m);
    for (let i = 0; i < m; i++) y[i] = Math.cos(2 * Math.PI * (12345.6 / rate) * i) + 0.003 * Math.cos(2 * Math.PI * (50 / rate) * i) + 0.0005 * random.normal();
    const { result } = analyzeSamples(y, rate);
    expect(result.spurs[0]).toMatchObject({ kind: "mains", label: "50 Hz mains" });
    expect(result.warnings).toEqual([]);
  });
});

describe("clipping at low oversampling", () => {
  it("a sine clipped at 65 % of its amplitude with 5 samples a period is flagged", () => {
    const m = 5000;
    const y = new Float64Array(m);
    for (let i = 0; i < m; i++) y[i] = Math.max(-0.65, Math.min(0.65, Math.cos(2 * Math.PI * 0.2013 * i + 0.2)));
    expect(codes(y, 1e6)).toContain("clipping");
  });

  it.each([3.3, 5.1, 7.7, 9.6])("an unclipped sine at %s samples a period is not", (samplesPerPeriod) => {
    const m = 5000;
    const y = noisyTone(m, 1 / samplesPerPeriod, 1, 0.1, 0.001, new SeededRandom(4));
    expect(codes(y, 1e6)).not.toContain("clipping");
  });

  it("an unclipped 8-bit sine at 5 samples a period is not (its extreme codes are a sine's own dwell)", () => {
    const m = 5000;
    const random = new SeededRandom(8);
    const step = 2 / 255;
    const y = Float64Array.from({ length: m }, (_, i) => Math.round((0.98 * Math.cos(2 * Math.PI * 0.1987 * i) + 0.002 * random.normal()) / step) * step);
    expect(codes(y, 1e6)).not.toContain("clipping");
  });
});

describe("a clean control capture", () => {
  it("carries no warning at all", () => {
    const y = noisyTone(50000, 0.01713, 1.2, 0.3, 0.002, new SeededRandom(21), 0.1);
    expect(codes(y, 10e6)).toEqual([]);
  });
});

describe("an honest 1σ", () => {
  const n = 20000;
  const cps = 0.01234;
  const zRms = (make: (random: SeededRandom) => Float64Array, records: number) => {
    let sumZ2 = 0;
    let sumWhiteZ2 = 0;
    for (let seed = 1; seed <= records; seed++) {
      const { result } = analyzeSamples(make(new SeededRandom(1000 + seed)), 1);
      const error = result.frequencyHz - cps;
      sumZ2 += (error / result.frequencyUncertaintyHz) ** 2;
      sumWhiteZ2 += (error / result.uncertainty.whiteNoiseHz) ** 2;
    }
    return { z: Math.sqrt(sumZ2 / records), whiteOnlyZ: Math.sqrt(sumWhiteZ2 / records) };
  };

  it("under white additive noise the z-scores have rms ≈ 1 (60 seeded records)", () => {
    const { z } = zRms((random) => noisyTone(n, cps, 1, random.uniform() * 6, 0.05, random), 60);
    expect(z).toBeGreaterThan(0.75);
    expect(z).toBeLessThan(1.3);
  });

  it("under white FM (oscillator frequency noise) too, where the white-noise σ alone is many times too small", () => {
    const { z, whiteOnlyZ } = zRms((random) => whiteFmTone(n, cps, 1, 2e-3, 0.01, random), 60);
    expect(whiteOnlyZ).toBeGreaterThan(10);
    expect(z).toBeGreaterThan(0.65);
    expect(z).toBeLessThan(1.5);
  });
});
