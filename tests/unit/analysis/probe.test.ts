import { describe, expect, it } from "vitest";
import { analyzeCapture, applyProbeAttenuation, importCapture } from "@/lib/analysis";

function captureCsv(samples: number, chirpPerSample = 0): string {
  const lines = ["time (s),Out (V)"];
  const fs = 1e6;
  for (let i = 0; i < samples; i++) {
    const cycles = 0.0123 * i + 0.5 * chirpPerSample * i * i;
    lines.push(`${(i / fs).toExponential(9)},${(0.5 * Math.sin(2 * Math.PI * cycles) + 0.05 * Math.sin(4 * Math.PI * cycles)).toFixed(9)}`);
  }
  return lines.join("\n");
}

describe("applyProbeAttenuation", () => {
  it("multiplies volts by the attenuation and leaves levels relative to the fundamental alone", () => {
    const csv = captureCsv(8192);
    const plain = analyzeCapture(importCapture(new TextEncoder().encode(csv))).result;
    const probed = analyzeCapture(applyProbeAttenuation(importCapture(new TextEncoder().encode(csv)), 10)).result;
    expect(probed.fundamentalVpk / plain.fundamentalVpk).toBeCloseTo(10, 9);
    expect(probed.vpp / plain.vpp).toBeCloseTo(10, 9);
    expect(probed.thdPercent).toBeCloseTo(plain.thdPercent as number, 9);
    expect(plain.harmonics[0].dBc).not.toBeNull();
    expect(probed.harmonics[0].dBc).toBeCloseTo(plain.harmonics[0].dBc!, 9);
    expect(probed.frequencyHz).toBeCloseTo(plain.frequencyHz, 6);
  });

  it("refuses an attenuation below 1 or not a number", () => {
    const capture = importCapture(new TextEncoder().encode(captureCsv(256)));
    expect(() => applyProbeAttenuation(capture, 0.1)).toThrow(/at least 1, got 0.1/);
    expect(() => applyProbeAttenuation(capture, Number.NaN)).toThrow(RangeError);
  });
});

describe("inRecordDrift in the result", () => {
  it("reports the thirds' frequencies and their difference in ppm", () => {
    const steady = analyzeCapture(importCapture(new TextEncoder().encode(captureCsv(8192)))).result;
    expect(steady.inRecordDrift).not.toBeNull();
    expect(Math.abs(steady.inRecordDrift!.ppm)).toBeLessThan(1);
    // A linear chirp: the frequency rises by 2e-10 cycles/sample per sample; the thirds' centres sit 2/3 of the
    // record apart, so last minus first is 2e-10 · 8192 · 2/3 cycles/sample (closed form of a linear chirp).
    const chirped = analyzeCapture(importCapture(new TextEncoder().encode(captureCsv(8192, 2e-10)))).result;
    const expectedPpm = ((2e-10 * 8192 * 2) / 3 / (0.0123 + 2e-10 * 8192 / 6)) * 1e6;
    expect(chirped.inRecordDrift!.ppm).toBeGreaterThan(0.8 * expectedPpm);
    expect(chirped.inRecordDrift!.ppm).toBeLessThan(1.2 * expectedPpm);
    expect(chirped.warnings.map((w) => w.code)).toContain("in-record-drift");
  });
});
