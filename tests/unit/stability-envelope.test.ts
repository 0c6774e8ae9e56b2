/**
 * Start-up and ring-down of the envelope. Ring-down: A(t) = A0·e^{−t/τ}, Q = π·f0·τ (REFERENCES.md
 * "Ring-down Q" [memory], check f0 = 455 kHz, Q = 80 → τ = 55.97 µs [computed]). Start-up: a planted
 * exponential envelope a0·e^{g·t} from the switch-on, limited at the settled amplitude, so 90 % is
 * reached ln(0.9/a0)/g after the oscillation appears (derived).
 */
import { describe, expect, it } from "vitest";
import { analyzeSamples } from "../../lib/analysis";
import { SeededRandom } from "../helpers/signals";

const FS = 10e6;

function tone(samples: number, frequencyHz: number, envelope: (t: number) => number, noiseVrms: number, seed: number): Float64Array {
  const random = new SeededRandom(seed);
  const y = new Float64Array(samples);
  for (let n = 0; n < samples; n++) {
    const t = n / FS;
    y[n] = envelope(t) * Math.cos(2 * Math.PI * frequencyHz * t + 0.7) + noiseVrms * random.normal();
  }
  return y;
}

describe("a pinged tank's ring-down", () => {
  const f0 = 455e3;
  const tau = 80 / (Math.PI * f0);
  const { result } = analyzeSamples(tone(4096, f0, (t) => Math.exp(-t / tau), 1e-4, 1801), FS, { plot: false });
  const envelope = result.stability!.envelope;

  it("is 55.97 µs for Q = 80 at 455 kHz (the reference's check value)", () => {
    expect(tau).toBeCloseTo(55.97e-6, 8);
  });

  it("recovers τ and Q = π·f0·τ within their stated uncertainty", () => {
    expect(envelope.kind).toBe("ring-down");
    expect(envelope.reason).toBeNull();
    expect(Math.abs(envelope.decayTauS! - tau)).toBeLessThan(Math.max(3 * envelope.decayTauSigmaS!, 0.01 * tau));
    expect(envelope.decayTauS! / tau).toBeGreaterThan(0.98);
    expect(envelope.decayTauS! / tau).toBeLessThan(1.02);
    expect(envelope.q! / 80).toBeGreaterThan(0.98);
    expect(envelope.q! / 80).toBeLessThan(1.02);
    expect(envelope.qSigma! / envelope.q!).toBeCloseTo(envelope.decayTauSigmaS! / envelope.decayTauS!, 9);
    expect(envelope.qSigma!).toBeGreaterThan(0);
    expect(envelope.curve!.timeS.length).toBeGreaterThan(10);
  });

  it("keeps the not-steady warning (a spec still fails it) and adds the figure", () => {
    const warning = result.warnings.find((w) => w.code === "not-steady");
    expect(warning?.message).toMatch(/Ring-down measured: decay time constant .*Q = 8\d\.\d+ ±/);
  });

  it("does not read the decay as phase noise", () => {
    expect(result.stability!.jitter.rmsPhaseRad).toBeNull();
    expect(result.stability!.jitter.reason).toMatch(/not steady/);
    expect(result.stability!.allan.points).toEqual([]);
  });
});

describe("a start-up transient", () => {
  const f0 = 123_456.7;
  const onS = 1e-3;
  const a0 = 0.05;
  const growth = 2000;
  const envelope = (t: number) => (t < onS ? 0 : Math.min(1, a0 * Math.exp(growth * (t - onS))));
  const { result } = analyzeSamples(tone(1 << 17, f0, envelope, 1e-3, 1802), FS, { plot: false });
  const measured = result.stability!.envelope;

  it("gives the time from first visible oscillation to 90 % of the settled amplitude", () => {
    expect(measured.kind).toBe("start-up");
    expect(measured.settledVpk!).toBeCloseTo(1, 2);
    const expected = Math.log(0.9 / a0) / growth;
    // Block resolution is one period (8.1 µs) at each end of a 1.45 ms interval.
    expect(Math.abs(measured.startUpS! - expected)).toBeLessThan(2 / f0);
  });

  it("gives the envelope's growth rate", () => {
    expect(measured.growthPerS! / growth).toBeGreaterThan(0.98);
    expect(measured.growthPerS! / growth).toBeLessThan(1.02);
  });

  it("keeps the not-steady code and says what was measured", () => {
    const warning = result.warnings.find((w) => w.code === "not-steady");
    expect(warning?.message).toMatch(/Start-up measured: 90 % of the settled .* after the oscillation appears, envelope growth 2\.0\de\+3 \/s/);
  });
});

describe("records without a transient figure", () => {
  it("a steady tone says so and stores no envelope curve", () => {
    const { result } = analyzeSamples(tone(1 << 16, 123_456.7, () => 1, 1e-3, 1803), FS, { plot: false });
    const envelope = result.stability!.envelope;
    expect(envelope.kind).toBe("steady");
    expect(envelope.curve).toBeNull();
    expect(envelope.startUpS).toBeNull();
    expect(envelope.reason).toMatch(/steady/);
    expect(result.warnings.some((w) => w.code === "not-steady")).toBe(false);
  });

  it("a start-up already running when the record begins has no start time", () => {
    const { result } = analyzeSamples(tone(1 << 17, 123_456.7, (t) => Math.min(1, 0.2 * Math.exp(2000 * t)), 1e-3, 1804), FS, { plot: false });
    const envelope = result.stability!.envelope;
    expect(envelope.kind).toBe("start-up");
    expect(envelope.startUpS).toBeNull();
    expect(envelope.reason).toMatch(/already visible/);
  });

  it("a record still growing at its end has no settled level", () => {
    const { result } = analyzeSamples(tone(1 << 17, 123_456.7, (t) => 0.01 * Math.exp(300 * t), 1e-3, 1805), FS, { plot: false });
    const envelope = result.stability!.envelope;
    expect(envelope.startUpS).toBeNull();
    expect(envelope.reason).not.toBeNull();
  });
});
