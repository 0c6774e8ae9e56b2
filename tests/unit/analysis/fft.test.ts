import { createRequire } from "node:module";
import { describe, expect, it } from "vitest";
import { fftPlan, nextPowerOfTwo, realFft } from "@/lib/analysis/fft";
import { directDft, SeededRandom } from "../../helpers/signals";

// fft-js 0.0.12 (npm registry, an independent recursive Cooley–Tukey implementation) as the reference.
const fftJs = createRequire(import.meta.url)("fft-js") as { fft: (x: number[]) => [number, number][] };

function randomSignal(n: number, seed: number): Float64Array {
  const random = new SeededRandom(seed);
  return Float64Array.from({ length: n }, () => random.normal());
}

describe("realFft", () => {
  it.each([4, 16, 64, 256, 1024, 4096])("matches fft-js on %i random samples", (n) => {
    const x = randomSignal(n, n);
    const ours = realFft(x);
    const reference = fftJs.fft(Array.from(x));
    const scale = Math.sqrt(n);
    for (let k = 0; k <= n / 2; k++) {
      expect(Math.abs(ours[2 * k] - reference[k][0])).toBeLessThan(1e-12 * scale * n);
      expect(Math.abs(ours[2 * k + 1] - reference[k][1])).toBeLessThan(1e-12 * scale * n);
    }
  });

  it.each([8, 32, 128])("matches a direct DFT on %i samples", (n) => {
    const x = randomSignal(n, 7 * n);
    const ours = realFft(x);
    const reference = directDft(x);
    for (let k = 0; k <= n / 2; k++) {
      expect(ours[2 * k]).toBeCloseTo(reference[2 * k], 10);
      expect(ours[2 * k + 1]).toBeCloseTo(reference[2 * k + 1], 10);
    }
  });

  it("puts an on-bin cosine of amplitude A at bin k with magnitude A·N/2", () => {
    const n = 1024;
    const x = Float64Array.from({ length: n }, (_, i) => 0.75 * Math.cos((2 * Math.PI * 37 * i) / n));
    const out = realFft(x);
    expect(Math.hypot(out[74], out[75])).toBeCloseTo(0.75 * (n / 2), 9);
    expect(Math.hypot(out[76], out[77])).toBeLessThan(1e-9);
  });

  it("rejects a length that is not a power of two", () => {
    expect(() => realFft(new Float64Array(1000))).toThrow(/power of two ≥ 2, got 1000/);
  });
});

describe("fftPlan", () => {
  it.each([16, 64, 1024, 32768, 65536])("gives the same spectrum as fft.js's own plan at size %i", (n) => {
    const x = randomSignal(n, 3 * n);
    const fast = new Float64Array(2 * n);
    const plain = new Float64Array(2 * n);
    fftPlan(n).realTransform(fast, x);
    fftPlan(n, false).realTransform(plain, x);
    for (let i = 0; i < n + 2; i++) expect(Math.abs(fast[i] - plain[i])).toBeLessThan(1e-9);
  });
});

describe("nextPowerOfTwo", () => {
  it("rounds up to a power of two", () => {
    expect([1, 2, 3, 64, 65, 1_000_000].map(nextPowerOfTwo)).toEqual([2, 2, 4, 64, 128, 1_048_576]);
  });
  it("rejects a non-integer", () => {
    expect(() => nextPowerOfTwo(2.5)).toThrow(RangeError);
  });
});
