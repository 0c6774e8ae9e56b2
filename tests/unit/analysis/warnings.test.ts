import { describe, expect, it } from "vitest";
import { analyzeCapture, importCapture, type WarningCode } from "@/lib/analysis";
import { checkClipping, checkDrift, checkEnvelope } from "@/lib/analysis/warnings";
import { type SynthCaptureOptions, synthCaptureCsv, synthSamples } from "../../helpers/signals";

// A healthy capture: 200 periods at 100 samples per period, harmonics, noise, DC, off-bin.
const HEALTHY: SynthCaptureOptions = {
  frequencyHz: 10_000.37,
  sampleRateHz: 1e6,
  samples: 20_000,
  amplitudeV: 1,
  noiseVrms: 0.002,
  dcV: 0.1,
  harmonicsDbc: [-30, -40],
  seed: 9,
};

function warningCodes(options: Partial<SynthCaptureOptions>): WarningCode[] {
  const { result } = analyzeCapture(importCapture(synthCaptureCsv({ ...HEALTHY, ...options })));
  return result.warnings.map((w) => w.code);
}

describe("buildWarnings (through analyzeCapture)", () => {
  it("raises nothing for a healthy capture, with or without 10-bit quantization", () => {
    expect(warningCodes({})).toEqual([]);
    expect(warningCodes({ quantizationBits: 10, fullScaleV: 1.4 })).toEqual([]);
    expect(warningCodes({ seed: 10, frequencyHz: 10_000, noiseVrms: 0 })).toEqual([]); // coherent and noiseless
  });

  it("flags clipping for flat tops at both extremes", () => {
    expect(warningCodes({ clipV: 0.85 })).toEqual(["clipping"]);
  });

  it("flags a start-up transient and a dying oscillation as not steady", () => {
    expect(warningCodes({ startupTauS: 0.003 })).toEqual(["not-steady"]);
    expect(warningCodes({ decayTauS: 0.05 })).toEqual(["not-steady"]);
  });

  it("flags a record of fewer than 10 periods", () => {
    expect(warningCodes({ samples: 500 })).toEqual(["few-cycles"]);
  });

  it("flags fewer than 5 samples per period", () => {
    expect(warningCodes({ frequencyHz: 301_234.5, harmonicsDbc: [] })).toEqual(["low-oversampling"]);
  });

  it("flags a frequency that moves within the record", () => {
    expect(warningCodes({ driftHz: 2 })).toEqual(["in-record-drift"]);
  });

  it("writes a plain sentence with the figures for each warning", () => {
    const { result } = analyzeCapture(importCapture(synthCaptureCsv({ ...HEALTHY, driftHz: 2, clipV: 0.9 })));
    const drift = result.warnings.find((w) => w.code === "in-record-drift");
    expect(drift?.message).toMatch(/^The frequency moves within the record: first third 9999\.\d+ Hz, last third 10001\.\d+ Hz \(13\d ppm/);
    expect(result.warnings.find((w) => w.code === "clipping")?.message).toMatch(/^Flat tops: \d+\.\d% of samples sit at the maximum/);
  });
});

describe("checkClipping", () => {
  it("does not mistake an 8-bit sine's dwell on its top code for clipping", () => {
    const y = synthSamples({ ...HEALTHY, quantizationBits: 8, fullScaleV: 1.2, noiseVrms: 0 }).channels[0];
    const check = checkClipping(y);
    expect(check.clippedTop || check.clippedBottom).toBe(false);
  });

  it("sees a plateau of 10 % of the record", () => {
    const check = checkClipping(synthSamples({ ...HEALTHY, harmonicsDbc: [], dcV: 0, clipV: Math.cos(Math.PI * 0.1) }).channels[0]);
    expect(check.clippedTop).toBe(true);
    expect(check.topFraction).toBeCloseTo(0.1, 2);
  });
});

describe("checkEnvelope", () => {
  it("measures an envelope that rises by a third across the record", () => {
    const y = synthSamples({ ...HEALTHY, harmonicsDbc: [], dcV: 0 }).channels[0].map((v, i, all) => v * (0.75 + (0.25 * i) / all.length));
    const check = checkEnvelope(y, 1e6, HEALTHY.frequencyHz, 0.002) as NonNullable<ReturnType<typeof checkEnvelope>>;
    expect(check.segmentAmplitudesV).toHaveLength(8);
    expect(check.change).toBeGreaterThan(0.2);
    expect(check.change).toBeLessThan(0.25);
  });

  it("skips records of under six periods", () => {
    expect(checkEnvelope(new Float64Array(1000), 1000, 5, 0)).toBeUndefined();
  });
});

describe("checkDrift", () => {
  it("finds the first and last thirds of a linear chirp where they should be", () => {
    const y = synthSamples({ ...HEALTHY, harmonicsDbc: [], dcV: 0, driftHz: 3 }).channels[0];
    const check = checkDrift(y, 1e6, HEALTHY.frequencyHz);
    // f(t) = f0 + 3 Hz·(t/T − ½): the thirds' mean frequencies sit 2 Hz apart.
    expect(check.lastThirdHz - check.firstThirdHz).toBeCloseTo(2, 1);
    expect(check.drifting).toBe(true);
  });
});
