/**
 * The harmonic fit's sample-by-sample passes (Reinsch's form of the Goertzel recurrence and of the
 * sinusoid generator) against the definitions summed directly: Σ y·cos(hωm) and Σ y·sin(hωm)
 * with Math.cos and Math.sin per sample and compensated (Neumaier) summation, and the model
 * a·cos + b·sin evaluated per sample. Short spans keep the reference's own argument round-off
 * (ulp of ω·m) below what is being checked. Frequencies cover both forms of the recurrence and the
 * ends where the plain form loses digits (ω near 0 and near π).
 */
import { describe, expect, it } from "vitest";
import { projectChannels, residualSums, writeCleaned } from "@/lib/analysis/harmonic-sums";
import { SeededRandom } from "../../helpers/signals";

function compensatedSum(terms: (k: number) => number, count: number): number {
  let sum = 0;
  let compensation = 0;
  for (let k = 0; k < count; k++) {
    const x = terms(k);
    const t = sum + x;
    compensation += Math.abs(sum) >= Math.abs(x) ? sum - t + x : x - t + sum;
    sum = t;
  }
  return sum + compensation;
}

function record(length: number, omega: number, seed: number): Float64Array {
  const random = new SeededRandom(seed);
  return Float64Array.from({ length }, (_, n) => 0.35 + 1.2 * Math.cos(omega * 1.0001 * n + 0.3) + 0.05 * Math.cos(2 * omega * n) + 0.002 * random.normal());
}

// ω in radians per sample: a long period, the bench's tone, mid-band, and next to Nyquist.
const OMEGAS = [0.0007, 0.0776, 1.3, 2.4, 3.1];

describe("projectChannels", () => {
  it.each(OMEGAS)("matches the direct sums at ω = %f, for one and two channels", (omega) => {
    const length = 6001; // three blocks and an odd tail
    const y = record(length, omega, 1);
    const z = record(length, omega * 0.999, 2);
    const orders = [1, 2, 3];
    const centre = (length - 1) / 2;
    const [one] = projectChannels([y], 0, length, omega, orders);
    const [py, pz] = projectChannels([y, z], 0, length, omega, orders);
    const scale = compensatedSum((k) => Math.abs(y[k]), length);
    for (const [channel, got] of [
      [y, one],
      [y, py],
      [z, pz],
    ] as const) {
      expect(Math.abs(got.pc[0] - compensatedSum((k) => channel[k], length)) / scale).toBeLessThan(1e-14);
      orders.forEach((order, i) => {
        const w = order * omega;
        const cos = compensatedSum((k) => channel[k] * Math.cos(w * (k - centre)), length);
        const sin = compensatedSum((k) => channel[k] * Math.sin(w * (k - centre)), length);
        expect(Math.abs(got.pc[i + 1] - cos) / scale, `cos, order ${order}`).toBeLessThan(2e-13);
        expect(Math.abs(got.ps[i] - sin) / scale, `sin, order ${order}`).toBeLessThan(2e-13);
      });
    }
  });

  it("sums a span inside the record with the index centred on the span", () => {
    const y = record(5000, 0.3, 3);
    const [span] = projectChannels([y], 1000, 3001, 0.3, [1]);
    const [copy] = projectChannels([y.slice(1000, 4001)], 0, 3001, 0.3, [1]);
    expect(span.pc[1]).toBeCloseTo(copy.pc[1], 10);
    expect(span.ps[0]).toBeCloseTo(copy.ps[0], 10);
  });
});

describe("residualSums and writeCleaned", () => {
  it.each(OMEGAS)("rebuilds the model and the cleaned record as the per-sample formula at ω = %f", (omega) => {
    const length = 4099;
    const y = record(length, omega, 4);
    const orders = [1, 2, 3];
    const cosV = Float64Array.of(0.9, 0.05, -0.01);
    const sinV = Float64Array.of(-0.4, 0.02, 0.003);
    const dcV = 0.35;
    const centre = (length - 1) / 2;
    const model = (k: number, from: number) => {
      let sum = 0;
      for (let i = from; i < orders.length; i++) {
        const w = orders[i] * omega * (k - centre);
        sum += cosV[i] * Math.cos(w) + sinV[i] * Math.sin(w);
      }
      return sum;
    };
    const cleaned = new Float64Array(length);
    const fitted = { start: 0, length, omega, dcV, cosV, sinV, orders };
    const sums = residualSums(y, fitted);
    const cleanedSums = writeCleaned(y, fitted, cleaned);
    let worst = 0;
    for (let k = 0; k < length; k++) worst = Math.max(worst, Math.abs(cleaned[k] - (y[k] - dcV - model(k, 1))));
    // Volts, against a model of about 1 V: round-off of a few hundred recurrence steps.
    expect(worst).toBeLessThan(1e-12);
    const noise = compensatedSum((k) => (y[k] - dcV - model(k, 0)) ** 2, length);
    const noiseAndDistortion = compensatedSum((k) => (y[k] - dcV - model(k, 0) + model(k, 1)) ** 2, length);
    expect(Math.abs(sums.noise - noise) / noise).toBeLessThan(1e-10);
    expect(Math.abs(sums.noiseAndDistortion - noiseAndDistortion) / noiseAndDistortion).toBeLessThan(1e-10);
    expect(cleanedSums.sum).toBeCloseTo(compensatedSum((k) => cleaned[k], length), 9);
    expect(cleanedSums.sumOfSquares).toBeCloseTo(compensatedSum((k) => cleaned[k] ** 2, length), 8);
  });
});
