import { describe, expect, it } from "vitest";
import { evaluateSpec, hasAnyLimit } from "@/lib/spec/evaluate";
import type { SpecMeasurements, StabilityMeasurements } from "@/lib/spec/types";

function measured(over: Partial<SpecMeasurements> = {}): SpecMeasurements {
  return { frequencyHz: 400_000, thdPercent: 1, harmonics: [], fundamentalVpk: 1, inRecordDriftPpm: null, warnings: [], ...over };
}

const stability = (over: StabilityMeasurements): StabilityMeasurements => over;
const only = (spec: Parameters<typeof evaluateSpec>[0], m: SpecMeasurements) => {
  const r = evaluateSpec(spec, m);
  expect(r.checks).toHaveLength(1);
  return { ...r.checks[0], verdict: r.verdict };
};

describe("rms jitter rule", () => {
  const jitter = (rmsJitterS: number | null, atFloor = false, reason: string | null = null) =>
    stability({ jitter: { rmsJitterS, atFloor, bandLowHz: 500, bandHighHz: 1e6, reason } });

  it("passes inside and fails outside the limit, margin in seconds", () => {
    const inside = only({ maxRmsJitterS: 1e-9 }, measured({ stability: jitter(400e-12) }));
    expect(inside).toMatchObject({ rule: "rms-jitter", outcome: "pass", unit: "s", verdict: "pass" });
    expect(inside.margin).toBeCloseTo(600e-12, 20);
    const outside = only({ maxRmsJitterS: 1e-9 }, measured({ stability: jitter(1.5e-9) }));
    expect(outside).toMatchObject({ outcome: "fail", verdict: "fail" });
    expect(outside.margin).toBeCloseTo(-0.5e-9, 20);
  });

  it("at the floor: a pass when the floor is inside the limit, otherwise cannot judge", () => {
    expect(only({ maxRmsJitterS: 1e-9 }, measured({ stability: jitter(200e-12, true) }))).toMatchObject({ outcome: "pass", message: expect.stringMatching(/at most 200 ps/) });
    expect(only({ maxRmsJitterS: 1e-10 }, measured({ stability: jitter(200e-12, true) }))).toMatchObject({ outcome: "cannot-judge", verdict: "inconclusive", measured: null });
  });

  it("cannot judge (never passes) with no stability figures or an unmeasured jitter", () => {
    expect(only({ maxRmsJitterS: 1e-9 }, measured())).toMatchObject({ outcome: "cannot-judge", passed: false, advice: expect.stringMatching(/re-analyse/) });
    expect(only({ maxRmsJitterS: 1e-9 }, measured({ stability: jitter(null, false, "the record holds too few periods") }))).toMatchObject({
      outcome: "cannot-judge",
      message: expect.stringMatching(/too few periods/),
    });
  });
});

describe("phase noise rule", () => {
  const points = (list: [number, number, number, boolean][]) =>
    stability({ phaseNoise: { points: list.map(([offsetHz, dbcPerHz, floorDbcPerHz, atFloor]) => ({ offsetHz, dbcPerHz, floorDbcPerHz, atFloor })), reason: null } });
  const spec = { phaseNoiseOffsetHz: 10_000, maxPhaseNoiseDbcPerHz: -100 };

  it("judges a measured point at the chosen offset only", () => {
    const pass = only(spec, measured({ stability: points([[1000, -80, -120, false], [10_000, -104.5, -130, false]]) }));
    expect(pass).toMatchObject({ rule: "phase-noise", outcome: "pass", measured: -104.5, unit: "dBc/Hz" });
    expect(pass.margin).toBeCloseTo(4.5, 9);
    expect(only(spec, measured({ stability: points([[10_000, -95, -130, false]]) }))).toMatchObject({ outcome: "fail", margin: -5 });
  });

  it("never reads a neighbouring offset: no point at 10 kHz is cannot judge, naming the offsets there are", () => {
    const r = only(spec, measured({ stability: points([[1000, -120, -140, false], [100_000, -130, -140, false]]) }));
    expect(r).toMatchObject({ outcome: "cannot-judge", message: expect.stringMatching(/no estimate at 10 kHz.*1 kHz, 100 kHz/) });
  });

  it("at the floor passes only when the floor itself is below the limit", () => {
    expect(only(spec, measured({ stability: points([[10_000, -108, -108, true]]) }))).toMatchObject({ outcome: "pass", measured: -108 });
    expect(only(spec, measured({ stability: points([[10_000, -95, -95, true]]) }))).toMatchObject({ outcome: "cannot-judge", measured: null });
  });

  it("is not checked without both the offset and the limit", () => {
    expect(evaluateSpec({ maxPhaseNoiseDbcPerHz: -100 }, measured()).checks).toEqual([]);
  });
});

describe("start-up rule", () => {
  const envelope = (kind: "steady" | "start-up" | "ring-down" | "unknown", startUpS: number | null) => stability({ envelope: { kind, startUpS, reason: null } });

  it("judges a start-up record and says cannot judge on a steady one", () => {
    expect(only({ maxStartUpS: 0.01 }, measured({ stability: envelope("start-up", 0.004) }))).toMatchObject({ rule: "start-up", outcome: "pass", margin: 0.006 });
    expect(only({ maxStartUpS: 0.001 }, measured({ stability: envelope("start-up", 0.004) }))).toMatchObject({ outcome: "fail" });
    expect(only({ maxStartUpS: 0.01 }, measured({ stability: envelope("steady", null) }))).toMatchObject({ outcome: "cannot-judge", message: expect.stringMatching(/steady/) });
    expect(only({ maxStartUpS: 0.01 }, measured({ stability: envelope("ring-down", null) }))).toMatchObject({ outcome: "cannot-judge", message: expect.stringMatching(/decaying/) });
  });
});

describe("build-level pushing and tempco rules", () => {
  const sens = (pushing: SpecMeasurements["buildSensitivity"] extends infer T ? (T extends { pushing: infer P } ? P : never) : never) => ({ pushing, tempco: { measured: false as const, reason: "no spread: every run is at 23 °C" } });

  it("judges |pushing| against the limit, cannot judge when the 1σ spans it", () => {
    expect(only({ maxPushingPpmPerV: 50 }, measured({ buildSensitivity: sens({ measured: true, ppm: -30, ppmSigma: 4, runs: 5 }) }))).toMatchObject({
      rule: "pushing",
      outcome: "pass",
      margin: 20,
      unit: "ppm/V",
      message: "The build's pushing is −30.0 ± 4.0 ppm/V over 5 runs against ±50 ppm/V: inside by 20.0 ppm/V.",
    });
    expect(only({ maxPushingPpmPerV: 20 }, measured({ buildSensitivity: sens({ measured: true, ppm: -30, ppmSigma: 4, runs: 5 }) }))).toMatchObject({ outcome: "fail", margin: -10 });
    expect(only({ maxPushingPpmPerV: 28 }, measured({ buildSensitivity: sens({ measured: true, ppm: -30, ppmSigma: 4, runs: 5 }) }))).toMatchObject({ outcome: "cannot-judge", margin: null });
  });

  it("not measured or not computed is cannot judge with the reason, never a pass", () => {
    const r = only({ maxTempcoPpmPerK: 50 }, measured({ buildSensitivity: sens({ measured: true, ppm: 1, ppmSigma: 1, runs: 3 }) }));
    expect(r).toMatchObject({ rule: "tempco", outcome: "cannot-judge", passed: false, message: expect.stringMatching(/no spread/) });
    expect(only({ maxTempcoPpmPerK: 50 }, measured())).toMatchObject({ outcome: "cannot-judge", message: expect.stringMatching(/not computed/) });
  });

  it("counts as a limit for hasAnyLimit, and a failing warning still fails the run beside a cannot-judge", () => {
    expect(hasAnyLimit({ maxTempcoPpmPerK: 50 })).toBe(true);
    expect(hasAnyLimit({ phaseNoiseOffsetHz: 1e4 })).toBe(false);
    const r = evaluateSpec({ maxStartUpS: 0.01 }, measured({ warnings: [{ code: "not-steady", message: "Not steady." }] }));
    expect(r.verdict).toBe("fail");
    expect(r.checks.map((c) => c.outcome)).toEqual(["cannot-judge", "fail"]);
  });
});
