import { describe, expect, it } from "vitest";
import { realFft } from "@/lib/analysis/fft";
import { type WindowName, windowFactors, windowSamples } from "@/lib/analysis/windows";

// REFERENCES.md §3, values at N = 4096 [computed], cross-checked against Harris 1978 Table 1 and
// Heinzel, Rüdiger & Schilling 2002 (GH_FFT.pdf) where they publish them.
const TABLE: { name: WindowName; cg: number; nenbw: number; scallopDb: number; source: string }[] = [
  { name: "rectangular", cg: 1.0, nenbw: 1.0, scallopDb: -3.9224, source: "Harris 1978 Table 1: 1.00, 3.92 dB" },
  { name: "hann", cg: 0.5, nenbw: 1.5, scallopDb: -1.4236, source: "Harris 1978: CG 0.50, ENBW 1.50, SL 1.42 dB; Heinzel 2002: 1.5, −1.4236" },
  { name: "hamming", cg: 0.54, nenbw: 1.3628, scallopDb: -1.7514, source: "Harris 1978: ENBW 1.36" },
  { name: "blackman", cg: 0.42, nenbw: 1.7268, scallopDb: -1.0989, source: "Harris 1978: ENBW 1.73, SL 1.10 dB" },
  { name: "blackman-harris-4", cg: 0.35875, nenbw: 2.0044, scallopDb: -0.8256, source: "Harris 1978: CG 0.36, ENBW 2.00, SL 0.83 dB; Heinzel BH92 2.0044" },
  { name: "nuttall-4c", cg: 0.36358, nenbw: 1.9761, scallopDb: -0.8506, source: "Nuttall 1981 (from memory)" },
  { name: "hft95", cg: 0.21364, nenbw: 3.8112, scallopDb: 0.0044, source: "Heinzel 2002 App. D: 3.8112, +0.0044 dB" },
];

/** |W(δ)| / |W(0)| of the window's DTFT at δ bins, by zero-padded FFT (16× padding: δ = ½ lands on a bin). */
function responseDb(w: Float64Array, offsetBins: number): number {
  const padding = 16;
  const padded = new Float64Array(w.length * padding);
  padded.set(w);
  const out = realFft(padded);
  const k = Math.round(offsetBins * padding);
  return 20 * Math.log10(Math.hypot(out[2 * k], out[2 * k + 1]) / Math.abs(out[0]));
}

describe("windowFactors", () => {
  it.each(TABLE)("$name: coherent gain and NENBW ($source)", ({ name, cg, nenbw }) => {
    const factors = windowFactors(windowSamples(name, 4096));
    expect(factors.coherentGain).toBeCloseTo(cg, 4); // tol 1e-5 suggested; table gives 5 digits
    expect(Math.abs(factors.nenbwBins - nenbw)).toBeLessThan(1e-4);
  });

  it("gives ENBW 1500 Hz for Hann at 1 MS/s over 1000 samples (REFERENCES.md §3)", () => {
    const { nenbwBins } = windowFactors(windowSamples("hann", 1000));
    expect(nenbwBins * (1e6 / 1000)).toBeCloseTo(1500, 6);
  });
});

/** The response within ±½ bin that lies furthest from 0 dB (Heinzel 2002 "emax"), by direct DTFT. */
function worstErrorDb(w: Float64Array): number {
  const n = w.length;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += w[i];
  let worst = 0;
  for (let step = 0; step <= 100; step++) {
    const delta = step / 200;
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      re += w[i] * Math.cos((2 * Math.PI * delta * i) / n);
      im -= w[i] * Math.sin((2 * Math.PI * delta * i) / n);
    }
    const db = 20 * Math.log10(Math.hypot(re, im) / sum);
    if (Math.abs(db) > Math.abs(worst)) worst = db;
  }
  return worst;
}

describe("windowSamples", () => {
  it.each(TABLE.filter((row) => row.name !== "hft95"))(
    "$name: scallop loss at half a bin is $scallopDb dB ($source)",
    ({ name, scallopDb }) => {
      expect(Math.abs(responseDb(windowSamples(name, 4096), 0.5) - scallopDb)).toBeLessThan(1e-3);
    },
  );

  it("hft95: largest amplitude error within half a bin is +0.0044 dB (Heinzel 2002 App. D, from memory)", () => {
    expect(Math.abs(worstErrorDb(windowSamples("hft95", 4096)) - 0.0044)).toBeLessThan(2e-4);
  });

  it("uses the periodic (DFT-even) form: Hann starts at 0 and peaks at N/2 (Harris 1978 §IV)", () => {
    const w = windowSamples("hann", 8);
    expect(w[0]).toBeCloseTo(0, 15);
    expect(w[4]).toBeCloseTo(1, 15);
    expect(w[1]).toBeCloseTo(w[7], 15);
  });

  it("keeps the 4-term Blackman–Harris coefficients of Harris 1978 (−92 dB sidelobes)", () => {
    // REFERENCES.md §3: 0.35875, 0.48829, 0.14128, 0.01168 [seen]; w[N/2] = Σ a_k = 1.
    const w = windowSamples("blackman-harris-4", 4096);
    expect(w[2048]).toBeCloseTo(0.35875 + 0.48829 + 0.14128 + 0.01168, 12);
    expect(w[0]).toBeCloseTo(0.35875 - 0.48829 + 0.14128 - 0.01168, 12);
  });

  it("rejects a length that is not a positive integer", () => {
    expect(() => windowSamples("hann", 0)).toThrow(/positive integer, got 0/);
  });
});
