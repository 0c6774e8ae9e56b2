import { describe, expect, it } from "vitest";
import { peakToDbv, spectrumPlot, waveformEnvelope } from "@/lib/analysis/plot";
import { windowedSpectrum } from "@/lib/analysis/spectrum";

describe("waveformEnvelope", () => {
  it("keeps every excursion of a long record in at most maxPoints buckets", () => {
    const y = Float64Array.from({ length: 100_001 }, (_, n) => Math.sin(n / 50) + (n === 71_234 ? 5 : 0));
    const envelope = waveformEnvelope(y, 1e3, 2, 2000);
    expect(envelope.timeS.length).toBeLessThanOrEqual(2000);
    expect(Math.max(...envelope.maxV)).toBe(Math.max(...y));
    expect(Math.max(...y)).toBeGreaterThan(3.9);
    expect(envelope.timeS[0]).toBe(2);
    expect(envelope.minV.every((v, i) => v <= envelope.maxV[i])).toBe(true);
  });

  it("returns the samples themselves when the record is short", () => {
    const envelope = waveformEnvelope(Float64Array.of(1, 2, 3), 10, 0, 2000);
    expect(envelope).toEqual({ timeS: [0, 0.1, 0.2], minV: [1, 2, 3], maxV: [1, 2, 3], samplesPerPoint: 1 });
  });
});

describe("spectrumPlot", () => {
  it("keeps the largest bin of each group so a narrow spur survives the reduction", () => {
    const n = 1 << 16;
    const y = Float64Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * 1000 * i) / n) + 1e-4 * Math.cos((2 * Math.PI * 20_000.5 * i) / n));
    const plot = spectrumPlot(windowedSpectrum(y, n), 500);
    expect(plot.dBV.length).toBeLessThanOrEqual(500);
    const spur = plot.frequencyHz.findIndex((f) => Math.abs(f - 20_000.5) < 1);
    expect(spur).toBeGreaterThan(0);
    expect(plot.dBV[spur]).toBeGreaterThan(peakToDbv(1e-4) - 1);
  });
});

describe("peakToDbv", () => {
  it("is dB re 1 V rms, floored so JSON never meets −∞", () => {
    expect(peakToDbv(Math.SQRT2)).toBeCloseTo(0, 12);
    expect(peakToDbv(0)).toBe(-400);
  });
});
