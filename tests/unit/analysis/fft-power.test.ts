/**
 * addRealPower (a real DFT's power through a half-length complex FFT) against the definition
 * X[k] = Σ x[n]·e^(−2πikn/N) summed directly, against fft.js's own real transform, and on a tone
 * centred on a bin, whose power is (A·N/2)² in that bin and 0 elsewhere (a closed form).
 */
import { describe, expect, it } from "vitest";
import { addRealPower, realFft } from "@/lib/analysis/fft";
import { SeededRandom } from "../../helpers/signals";

function directPower(x: Float64Array): Float64Array {
  const n = x.length;
  const power = new Float64Array(n / 2 + 1);
  for (let k = 0; k <= n / 2; k++) {
    let re = 0;
    let im = 0;
    for (let j = 0; j < n; j++) {
      const angle = (2 * Math.PI * ((k * j) % n)) / n;
      re += x[j] * Math.cos(angle);
      im -= x[j] * Math.sin(angle);
    }
    power[k] = re * re + im * im;
  }
  return power;
}

function worstAgainstPeak(got: Float64Array, want: ArrayLike<number>): number {
  let peak = 0;
  for (let k = 0; k < got.length; k++) peak = Math.max(peak, want[k]);
  let worst = 0;
  for (let k = 0; k < got.length; k++) worst = Math.max(worst, Math.abs(got[k] - want[k]) / peak);
  return worst;
}

describe("addRealPower", () => {
  it.each([2, 4, 8, 16, 64, 256, 1024])("matches the directly summed DFT at N = %i", (n) => {
    const random = new SeededRandom(n);
    const x = Float64Array.from({ length: n }, () => random.normal());
    const power = new Float64Array(n / 2 + 1);
    addRealPower(x, power);
    expect(worstAgainstPeak(power, directPower(x))).toBeLessThan(1e-13);
  });

  it.each([1 << 12, 1 << 15, 1 << 18])("matches fft.js's real transform at N = %i", (n) => {
    const random = new SeededRandom(n);
    const x = Float64Array.from({ length: n }, (_, i) => Math.cos(0.37 * i) + 0.01 * random.normal());
    const bins = realFft(x);
    const want = Float64Array.from({ length: n / 2 + 1 }, (_, k) => bins[2 * k] ** 2 + bins[2 * k + 1] ** 2);
    const power = new Float64Array(n / 2 + 1);
    addRealPower(x, power);
    expect(worstAgainstPeak(power, want)).toBeLessThan(1e-13);
  });

  it("puts a bin-centred tone's whole power, (A·N/2)², in its bin", () => {
    const n = 4096;
    const bin = 357;
    const x = Float64Array.from({ length: n }, (_, i) => 0.8 * Math.cos((2 * Math.PI * bin * i) / n + 0.4));
    const power = new Float64Array(n / 2 + 1);
    addRealPower(x, power);
    expect(power[bin] / (0.8 * (n / 2)) ** 2).toBeCloseTo(1, 12);
    let rest = 0;
    for (let k = 0; k < power.length; k++) if (k !== bin) rest = Math.max(rest, power[k]);
    expect(rest / power[bin]).toBeLessThan(1e-24);
  });

  it("adds to what is there and reuses its scratch buffer", () => {
    const x = Float64Array.from({ length: 64 }, (_, i) => Math.sin(i));
    const once = new Float64Array(33);
    const scratch = addRealPower(x, once);
    const twice = new Float64Array(33);
    expect(addRealPower(x, twice, scratch)).toBe(scratch);
    addRealPower(x, twice, scratch);
    for (let k = 0; k < 33; k++) expect(twice[k]).toBeCloseTo(2 * once[k], 10);
  });

  it("refuses a length that is not a power of two, and too few bins", () => {
    expect(() => addRealPower(new Float64Array(12), new Float64Array(7))).toThrow(/power of two/);
    expect(() => addRealPower(new Float64Array(16), new Float64Array(8))).toThrow(/needs 9 bins/);
  });
});
