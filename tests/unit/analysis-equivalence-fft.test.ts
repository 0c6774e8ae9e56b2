/**
 * The real-only FFT plans (a table cut to the part fft.js's real transform reads) give the same
 * bits as the full plans, at every size with either parity of log2 N (fft.js's radix-4 steps end
 * differently for the two).
 */
import { describe, expect, it } from "vitest";
import { fftPlan, realFft } from "../../lib/analysis/fft";
import { SeededRandom } from "../helpers/signals";

describe("real-only FFT plans", () => {
  const sizes = Array.from({ length: 15 }, (_, i) => 1 << (i + 4)); // 16 … 2^18
  it.each(sizes)("match the full plan bit for bit at N = %i", (n) => {
    const random = new SeededRandom(n);
    const x = Float64Array.from({ length: n }, () => random.normal());
    const full = new Float64Array(2 * n);
    fftPlan(n).realTransform(full, x);
    const real = realFft(x);
    for (let k = 0; k <= n / 2 + 1; k++) {
      expect(Object.is(real[2 * k], full[2 * k]) && Object.is(real[2 * k + 1], full[2 * k + 1]), `bin ${k}`).toBe(true);
    }
  });
});
