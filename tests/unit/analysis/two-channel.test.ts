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

  it("reads no gain or phase from a flat channel, or from one holding only noise, and says why", () => {
    const { channels } = synthSamples({ ...LOOP, noiseVrms: 0.001 });
    const flat = gainPhaseAtFundamental(channels[0], new Float64Array(LOOP.samples), LOOP.sampleRateHz, LOOP.frequencyHz);
    expect(flat).toMatchObject({ gainDb: null, phaseDeg: null, otherVpk: 0 });
    expect(flat.reason).toMatch(/flat/);
    // White noise of σ = 10 mV: a fitted amplitude's σ is σ·√(2/N) ≈ 82 µV, so the 4σ limit is ≈ 0.33 mV.
    let state = 7;
    const uniform = () => (state = (state * 16807) % 2147483647) / 2147483647;
    const noise = Float64Array.from({ length: LOOP.samples }, () => 0.01 * Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform()));
    const loose = gainPhaseAtFundamental(channels[0], noise, LOOP.sampleRateHz, LOOP.frequencyHz);
    expect(loose.gainDb).toBeNull();
    expect(loose.phaseDeg).toBeNull();
    expect(loose.otherDetectionLimitVpk).toBeCloseTo(4 * 0.01 * Math.sqrt(2 / LOOP.samples), 4);
    expect(loose.reason).toMatch(/^the compared channel shows no tone at the fundamental: .* under its noise's detection limit/);
  });

  it("still measures a weak channel that stands clear of its noise (−60 dB)", () => {
    const { channels } = synthSamples({ ...LOOP, noiseVrms: 0.001, second: { gainDb: -60, phaseDeg: 90, noiseVrms: 0.0001 } });
    const gp = gainPhaseAtFundamental(channels[0], channels[1], LOOP.sampleRateHz, LOOP.frequencyHz);
    expect(gp.reason).toBeNull();
    expect(gp.gainDb).toBeCloseTo(-60, 1);
    expect(gp.phaseDeg).toBeCloseTo(90, 0);
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
