import { describe, expect, it } from "vitest";
import { fitHarmonics, fitHarmonicsOfChannels, foldedRadPerSample, separableOrders } from "@/lib/analysis/harmonic-fit";
import { thdRatio } from "@/lib/analysis/metrics";
import { bandLimitedThd, bandLimitedWave, harmonicLaw, SeededRandom, type WaveShape } from "../../helpers/signals";

// REFERENCES.md §2 closed-form THD_F over orders 2..H [computed]; Blagouchine & Moreau 2011.
const PUBLISHED: { shape: WaveShape; h5: number; h10: number }[] = [
  { shape: "square", h5: 0.38873, h10: 0.428795 },
  { shape: "triangle", h5: 0.118092, h10: 0.120477 },
  { shape: "sawtooth", h5: 0.68089, h10: 0.741463 },
];

function thdOf(y: Float64Array, cyclesPerSample: number, maxOrder: number): number {
  const fit = fitHarmonics(y, 2 * Math.PI * cyclesPerSample, maxOrder);
  return thdRatio(fit.amplitudesVpk[0], fit.amplitudesVpk.slice(1));
}

describe("bandLimitedThd", () => {
  it.each(PUBLISHED)("$shape: the amplitude law gives the REFERENCES.md §2 table for H = 5 and 10", ({ shape, h5, h10 }) => {
    expect(Math.abs(bandLimitedThd(shape, 5) - h5)).toBeLessThan(1e-6);
    expect(Math.abs(bandLimitedThd(shape, 10) - h10)).toBeLessThan(1e-6);
  });

  it("approaches the infinite-series closed forms √(π²/8−1), √(π⁴/96−1), √(π²/6−1) (REFERENCES.md §2)", () => {
    expect(bandLimitedThd("square", 20001)).toBeCloseTo(Math.sqrt(Math.PI ** 2 / 8 - 1), 3);
    expect(bandLimitedThd("triangle", 2001)).toBeCloseTo(Math.sqrt(Math.PI ** 4 / 96 - 1), 6);
    expect(bandLimitedThd("sawtooth", 20001)).toBeCloseTo(Math.sqrt(Math.PI ** 2 / 6 - 1), 3);
  });
});

describe("fitHarmonics", () => {
  it.each(PUBLISHED)("$shape, coherent record: THD over orders 2..10 is $h10 (REFERENCES.md §2, tol 1e-4)", ({ shape, h10 }) => {
    const y = bandLimitedWave(shape, 4096, 16 / 4096, 10);
    expect(Math.abs(thdOf(y, 16 / 4096, 10) - h10)).toBeLessThan(1e-4);
  });

  it.each(PUBLISHED)("$shape, non-coherent record: THD over orders 2..5 is $h5 (REFERENCES.md §2)", ({ shape, h5 }) => {
    // 37.37 periods: the tone sits between bins, where reading FFT bins would leak.
    const cycles = 37.37 / 5000;
    const y = bandLimitedWave(shape, 5000, cycles, 5);
    expect(Math.abs(thdOf(y, cycles, 5) - h5)).toBeLessThan(1e-6);
  });

  it("recovers each harmonic's amplitude of a non-coherent sawtooth to 1e-9 relative", () => {
    const cycles = 0.0123456;
    const fit = fitHarmonics(bandLimitedWave("sawtooth", 3000, cycles, 10, 2), 2 * Math.PI * cycles, 10);
    fit.amplitudesVpk.forEach((a, i) => expect(Math.abs(a / (2 * Math.abs(harmonicLaw("sawtooth", i + 1))) - 1)).toBeLessThan(1e-9));
  });

  it("fits orders above Nyquist where they fold to, |h·f − k·fs| (IEEE Std 1241 practice), and recovers their level", () => {
    // 0.131 fs: order 4 is at 0.524 fs and is seen at 0.476 fs; planted at −25 dBc.
    const n = 4000;
    const cycles = 0.131;
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) y[i] = Math.cos(2 * Math.PI * cycles * i + 0.3) + 0.0562341 * Math.cos(2 * Math.PI * 4 * cycles * i + 1.1);
    const fit = fitHarmonics(y, 2 * Math.PI * cycles, 10);
    expect(fit.orders).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(fit.amplitudesVpk[3]).toBeCloseTo(0.0562341, 9);
    expect(foldedRadPerSample(2 * Math.PI * 4 * cycles) / (2 * Math.PI)).toBeCloseTo(1 - 4 * cycles, 12);
  });

  it("leaves out an order whose fold lands on DC, Nyquist, the fundamental or another order", () => {
    // f = fs/4 exactly: order 2 sits on Nyquist, 3 folds onto the fundamental, 4 onto DC, 5 onto the fundamental again.
    const split = separableOrders(Math.PI / 2, 1000, 6);
    expect(split.orders).toEqual([1]);
    expect(split.notSeparable.map((o) => [o.order, o.collidesWith])).toEqual([
      [2, "nyquist"],
      [3, "fundamental"],
      [4, "dc"],
      [5, "fundamental"],
      [6, "nyquist"],
    ]);
    // 0.2 fs: order 3 (0.6 → 0.4 fs) and order 2 (0.4 fs) land on each other.
    const pair = separableOrders(2 * Math.PI * 0.2, 1000, 3);
    expect(pair.notSeparable.map((o) => [o.order, o.collidesWith, o.otherOrder])).toEqual([
      [2, "harmonic", 3],
      [3, "harmonic", 2],
    ]);
  });

  it("splits the residual into noise and noise-plus-distortion", () => {
    const random = new SeededRandom(5);
    const cycles = 0.0317;
    const clean = bandLimitedWave("triangle", 20000, cycles, 10);
    const y = clean.map((v) => v + 0.01 * random.normal());
    const fit = fitHarmonics(y, 2 * Math.PI * cycles, 10);
    expect(Math.sqrt(fit.noiseSumOfSquares / y.length)).toBeCloseTo(0.01, 3);
    const harmonicPower = fit.amplitudesVpk.slice(1).reduce((sum, a) => sum + (a * a) / 2, 0);
    const nad = fit.noiseAndDistortionSumOfSquares / y.length;
    expect(nad / (harmonicPower + fit.noiseSumOfSquares / y.length)).toBeCloseTo(1, 3);
  });

  it("writes the record with DC and harmonics 2..H removed when asked", () => {
    const cycles = 0.01;
    const y = bandLimitedWave("square", 2000, cycles, 9).map((v) => v + 0.5);
    const cleaned = new Float64Array(y.length);
    fitHarmonics(y, 2 * Math.PI * cycles, 9, { cleanedOut: cleaned });
    for (let n = 0; n < y.length; n += 97) expect(cleaned[n]).toBeCloseTo(Math.sin(2 * Math.PI * cycles * n + 0.4), 9);
  });
});

describe("fitHarmonicsOfChannels", () => {
  it("gives each channel the same fit as fitting it alone", () => {
    const cycles = 0.0211;
    const a = bandLimitedWave("square", 3001, cycles, 7);
    const b = bandLimitedWave("sawtooth", 3001, cycles, 7, 0.3, 1.2);
    const [fa, fb] = fitHarmonicsOfChannels([a, b], 2 * Math.PI * cycles, 7);
    const alone = fitHarmonics(b, 2 * Math.PI * cycles, 7);
    expect(fa.amplitudesVpk[0]).toBeCloseTo(1, 10);
    fb.amplitudesVpk.forEach((v, i) => expect(v).toBeCloseTo(alone.amplitudesVpk[i], 12));
  });

  it("rejects channels of different lengths", () => {
    expect(() => fitHarmonicsOfChannels([new Float64Array(10), new Float64Array(11)], 0.1, 3)).toThrow(/same length/);
  });
});
