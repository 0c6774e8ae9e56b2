import { describe, expect, it } from "vitest";
import { analyzeCapture, gainPhaseAtFundamental, importCapture } from "@/lib/analysis";
import { synthCaptureCsv, synthSamples } from "../../helpers/signals";

const LOOP = { frequencyHz: 4_567.89, sampleRateHz: 500_000, samples: 30_000, amplitudeV: 1.5, harmonicsDbc: [-25, -33], seed: 21 };

describe("gainPhaseAtFundamental", () => {
  it.each([
    [-6.5, 135],
    [3.2, -170],
    [-20, 0.5],
  ])("recovers %d dB and %d° between two distorted, noisy channels", (gainDb, phaseDeg) => {
    const { channels } = synthSamples({ ...LOOP, noiseVrms: 0.001, second: { gainDb, phaseDeg, dcV: 0.7, noiseVrms: 0.001 } });
    const gp = gainPhaseAtFundamental(channels[0], channels[1], LOOP.sampleRateHz, LOOP.frequencyHz);
    expect(gp.gainDb).toBeCloseTo(gainDb, 2);
    expect(gp.phaseDeg).toBeCloseTo(phaseDeg, 1);
    expect(gp.referenceVpk).toBeCloseTo(1.5, 3);
  });

  it("rejects channels of different lengths", () => {
    expect(() => gainPhaseAtFundamental(new Float64Array(100), new Float64Array(99), 1, 0.1)).toThrow(/same length/);
  });
});

describe("analyzeCapture twoChannel", () => {
  it("compares the next channel with the analysed one, or the channel asked for", () => {
    const csv = synthCaptureCsv({ ...LOOP, noiseVrms: 0.002, second: { name: "Base", gainDb: -9.5, phaseDeg: 178 } });
    const { result } = analyzeCapture(importCapture(csv));
    expect(result.twoChannel?.referenceChannel).toBe("Out");
    expect(result.twoChannel?.channel).toBe("Base");
    expect(result.twoChannel?.gainDb).toBeCloseTo(-9.5, 2);
    expect(result.twoChannel?.phaseDeg).toBeCloseTo(178, 1);
    const reversed = analyzeCapture(importCapture(csv), { channel: "base" }).result.twoChannel;
    expect(reversed?.gainDb).toBeCloseTo(9.5, 2);
    expect(reversed?.phaseDeg).toBeCloseTo(-178, 1);
    expect(analyzeCapture(importCapture(csv), { compareChannel: false }).result.twoChannel).toBeNull();
  });
});
