import { describe, expect, it } from "vitest";
import { coarsePeakHz, windowedSpectrum } from "@/lib/analysis/spectrum";

function tone(n: number, bin: number, amplitude = 1): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => amplitude * Math.cos((2 * Math.PI * bin * i) / n + 0.3));
}

describe("windowedSpectrum", () => {
  it("reads a bin-centred tone's peak amplitude (A = 2|X|/Σw)", () => {
    const spectrum = windowedSpectrum(tone(4096, 300, 0.8), 4096);
    expect(spectrum.amplitudeVpk[300]).toBeCloseTo(0.8, 9);
    expect(spectrum.binHz).toBe(1);
  });

  it("reads a tone half a bin off low by the Blackman–Harris scallop loss, −0.8256 dB (Harris 1978; REFERENCES.md §3)", () => {
    const spectrum = windowedSpectrum(tone(4096, 300.5), 4096);
    const db = 20 * Math.log10(Math.max(spectrum.amplitudeVpk[300], spectrum.amplitudeVpk[301]));
    expect(Math.abs(db - -0.8256)).toBeLessThan(2e-3);
  });

  it("zero-pads to a power of two and removes the mean first", () => {
    const y = tone(3000, 100.3).map((v) => v + 10);
    const spectrum = windowedSpectrum(y, 3000);
    expect(spectrum.fftLength).toBe(4096);
    expect(spectrum.amplitudeVpk[0]).toBeLessThan(0.01); // 10 without the mean removed
  });

  it("averages 50 %-overlapping segments of a record longer than the limit", () => {
    const spectrum = windowedSpectrum(tone(10_000, 1234.5), 10_000, { maxFftLength: 2048 });
    expect(spectrum.segmentLength).toBe(2048);
    expect(spectrum.segments).toBe(9);
  });

  // The median is found by selection in a scratch copy (the window buffer): it must equal what a sort
  // gives and leave the bins themselves in order.
  it.each([
    ["one segment, padded", 3000, undefined],
    ["one segment, a power of two", 4096, undefined],
    ["averaged segments", 10_000, 2048],
  ])("carries the median bin, as a sort would place it, without reordering the bins (%s)", (_, n, maxFftLength) => {
    // A tone in seeded noise, so the bins are all different.
    let state = 12345;
    const noise = () => ((state = (state * 1103515245 + 12345) % 2147483648) / 2147483648 - 0.5) * 1e-3;
    const y = tone(n, 123.4).map((v) => v + noise());
    const spectrum = windowedSpectrum(y, n, maxFftLength === undefined ? {} : { maxFftLength });
    const bins = spectrum.amplitudeVpk;
    const sorted = Float64Array.from(bins).sort();
    expect(spectrum.medianAmplitudeVpk).toBe(sorted[bins.length >> 1]);
    // The tone's bin is still where the tone is, not moved by the selection.
    const peak = bins.indexOf(Math.max(...bins.subarray(10)));
    expect(Math.abs(peak * spectrum.binHz - 123.4)).toBeLessThan(2 * spectrum.binHz);
  });
});

describe("coarsePeakHz", () => {
  it("finds an off-bin tone to a few hundredths of a bin", () => {
    const n = 5000;
    const peak = coarsePeakHz(windowedSpectrum(tone(n, 321.37), n)) as number;
    expect(Math.abs(peak - 321.37)).toBeLessThan(0.05);
  });

  it("finds nothing in silence", () => {
    expect(coarsePeakHz(windowedSpectrum(new Float64Array(256), 1))).toBeUndefined();
  });
});
