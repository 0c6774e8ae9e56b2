import { describe, expect, it } from "vitest";
import { analyzeCapture, analyzeSamples, CaptureImportError, ENGINE_VERSION, importCapture } from "@/lib/analysis";
import { sinadFromSnrAndThdDb } from "@/lib/analysis/metrics";
import { cramerRaoFrequencyStdHz, type SynthCaptureOptions, synthCaptureCsv, synthSamples } from "../../helpers/signals";

const CAPTURE: SynthCaptureOptions = {
  frequencyHz: 1_234_567.89,
  sampleRateHz: 100e6,
  samples: 50_000,
  amplitudeV: 1.2,
  dcV: 0.35,
  harmonicsDbc: [-32, -41, -55, -60],
  noiseVrms: 0.002,
  seed: 77,
  second: { name: "Base", gainDb: -8, phaseDeg: 172, noiseVrms: 0.0015, dcV: 0.62 },
};

const REQUIRED_KEYS = [
  "channel", "samples", "sampleRateHz", "frequencyHz", "frequencyUncertaintyHz", "fundamentalVpk", "vpp", "vrms",
  "dcV", "thdPercent", "thdDb", "sinadDb", "snrDb", "sfdrDb", "enob", "harmonics", "warnings",
];

describe("analyzeCapture", () => {
  const { result, plot } = analyzeCapture(importCapture(synthCaptureCsv(CAPTURE)));

  it("measures a realistic non-coherent capture: frequency within its own uncertainty, near the CRLB", () => {
    const eta = CAPTURE.amplitudeV ** 2 / (2 * 0.002 ** 2);
    const bound = cramerRaoFrequencyStdHz(CAPTURE.sampleRateHz, CAPTURE.samples, eta); // Rife & Boorstyn 1974
    expect(Math.abs(result.frequencyHz - CAPTURE.frequencyHz)).toBeLessThan(4 * result.frequencyUncertaintyHz);
    expect(result.frequencyUncertaintyHz / bound).toBeGreaterThan(0.9);
    expect(result.frequencyUncertaintyHz / bound).toBeLessThan(1.1);
  });

  it("measures amplitude, DC, harmonics, noise and the figures derived from them", () => {
    expect(result.fundamentalVpk).toBeCloseTo(1.2, 3);
    expect(result.dcV).toBeCloseTo(0.35, 4);
    expect(result.harmonics.map((h) => h.order)).toEqual([2, 3, 4, 5, 6, 7, 8, 9, 10]);
    [-32, -41, -55, -60].forEach((dbc, i) => expect(Math.abs((result.harmonics[i].dBc as number) - dbc)).toBeLessThan(0.3));
    expect(result.harmonics[1].frequencyHz).toBeCloseTo(3 * result.frequencyHz, 6);
    expect(result.noiseVrms).toBeCloseTo(0.002, 4);
    // SNR of a sine of A/√2 rms over white noise σ.
    // (The noise rms of 50 000 samples is itself uncertain by 1/√(2N) ≈ 0.3 %, 0.03 dB.)
    expect(Math.abs((result.snrDb as number) - 20 * Math.log10(1.2 / Math.SQRT2 / 0.002))).toBeLessThan(0.15);
    // IEEE 1241 relations between the figures (REFERENCES.md §2).
    expect(result.sinadDb as number).toBeCloseTo(sinadFromSnrAndThdDb(result.snrDb as number, result.thdDb as number), 2);
    expect(result.enob as number).toBeCloseTo(((result.sinadDb as number) - 1.76) / 6.02, 12);
    expect(result.sfdrDb as number).toBeCloseTo(32, 1);
    expect(result.largestSpur?.kind).toBe("harmonic");
    expect(result.thdPercent).toBeCloseTo(100 * Math.sqrt(result.harmonics.reduce((s, h) => s + (h.amplitudeVpk ?? 0) ** 2, 0)) / result.fundamentalVpk, 9);
  });

  it("reports Vpp, total rms with DC, the channel, its metadata and the engine version", () => {
    expect(result.vpp).toBeCloseTo(result.maxV - result.minV, 12);
    expect(result.vrms).toBeCloseTo(Math.sqrt(0.35 ** 2 + 1.2 ** 2 / 2), 2);
    expect(result.channel).toBe("Out");
    expect(result.channels).toEqual(["Out", "Base"]);
    expect(result.engineVersion).toBe(ENGINE_VERSION);
    expect(result.warnings).toEqual([]);
  });

  it("has every field of the JSON contract and survives JSON unchanged", () => {
    for (const key of REQUIRED_KEYS) expect(result).toHaveProperty(key);
    expect(JSON.parse(JSON.stringify(result))).toEqual(result);
  });

  it("reduces the plot data to a few thousand points and keeps the peaks", () => {
    expect(plot.waveform.timeS.length).toBeLessThanOrEqual(2000);
    expect(Math.max(...plot.waveform.maxV)).toBe(result.maxV);
    expect(Math.min(...plot.waveform.minV)).toBe(result.minV);
    expect(plot.spectrum.dBV.length).toBeLessThanOrEqual(4000);
    const fundamentalDbv = 20 * Math.log10(1.2 / Math.SQRT2);
    expect(Math.max(...plot.spectrum.dBV)).toBeGreaterThan(fundamentalDbv - 0.9); // within BH4 scallop loss (Harris 1978)
    expect(plot.harmonicMarkers[0]).toMatchObject({ order: 1 });
    expect(plot.harmonicMarkers[0].dBV).toBeCloseTo(fundamentalDbv, 2);
  });

  it("counts the harmonics asked for, those above Nyquist at their folded frequency |h·f − k·fs|", () => {
    const capture = importCapture(synthCaptureCsv(CAPTURE));
    expect(analyzeCapture(capture, { harmonics: 5 }).result.harmonics.map((h) => h.order)).toEqual([2, 3, 4, 5]);
    const fast = synthSamples({ ...CAPTURE, frequencyHz: 11e6, second: undefined }).channels[0];
    const { harmonics } = analyzeSamples(fast, 100e6, { harmonics: 10 }).result;
    expect(harmonics.map((h) => h.order)).toEqual([2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(harmonics.filter((h) => h.folded).map((h) => h.order)).toEqual([5, 6, 7, 8, 9, 10]);
    // 5 × 11 MHz = 55 MHz is seen at 100 − 55 = 45 MHz; 9 × 11 = 99 MHz at 1 MHz.
    expect(harmonics[3].seenAtHz / 1e6).toBeCloseTo(45, 4);
    expect(harmonics[7].seenAtHz / 1e6).toBeCloseTo(1, 4);
  });

  it("analyses the channel asked for, and rejects one that is not there", () => {
    const capture = importCapture(synthCaptureCsv(CAPTURE));
    expect(analyzeCapture(capture, { channel: "BASE (V)" }).result.fundamentalVpk).toBeCloseTo(1.2 * 10 ** (-8 / 20), 3);
    expect(() => analyzeCapture(capture, { channel: "Emitter" })).toThrow(new CaptureImportError("no channel named 'Emitter'; the capture has Out, Base"));
  });

  it("rejects a flat channel", () => {
    expect(() => analyzeSamples(new Float64Array(1000).fill(0.5), 1e3)).toThrow(/no oscillation found/);
  });

  it("averages segments of a record longer than the FFT limit and gets the same figures", () => {
    const y = synthSamples({ ...CAPTURE, second: undefined }).channels[0];
    const whole = analyzeSamples(y, CAPTURE.sampleRateHz).result;
    const segmented = analyzeSamples(y, CAPTURE.sampleRateHz, { maxFftLength: 8192 });
    expect(segmented.result.frequencyHz).toBeCloseTo(whole.frequencyHz, 6);
    expect(segmented.result.thdPercent).toBeCloseTo(whole.thdPercent as number, 9);
    expect(segmented.plot.spectrum.binHz).toBeCloseTo(CAPTURE.sampleRateHz / 8192, 6);
  });

  it("sees the ideal 8-bit quantizer's SINAD of 6.02·8 + 1.76 = 49.93 dB on a full-scale sine (Kester, ADI MT-001)", () => {
    const fullScale = 1;
    const step = (2 * fullScale) / 256;
    // A non-coherent tone spreads the quantization error like white noise of q²/12.
    const y = Float64Array.from({ length: 100_000 }, (_, n) => {
      const v = (fullScale - step / 2) * Math.cos(2 * Math.PI * 0.0123457 * n);
      return Math.min(127, Math.max(-128, Math.floor(v / step))) * step + step / 2;
    });
    const { result: quantized } = analyzeSamples(y, 1);
    expect(Math.abs((quantized.sinadDb as number) - 49.93)).toBeLessThan(0.3);
    expect(Math.abs((quantized.enob as number) - 8)).toBeLessThan(0.05);
  });

  it("only ever throws CaptureImportError or RangeError for bad records", () => {
    expect(() => analyzeSamples(new Float64Array(10), 1)).toThrow(CaptureImportError);
    expect(() => analyzeSamples(new Float64Array(100), -1)).toThrow(RangeError);
    expect(() => analyzeSamples(new Float64Array(100), 1, { harmonics: 0 })).toThrow(RangeError);
  });
});
