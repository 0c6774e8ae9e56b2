import { describe, expect, it } from "vitest";
import { analyzeSamples } from "@/lib/analysis";
import { evaluateSpec } from "@/lib/spec/evaluate";
import type { SpecMeasurements } from "@/lib/spec/types";
import { noisyTone, SeededRandom } from "../../helpers/signals";

function fromResult(result: ReturnType<typeof analyzeSamples>["result"]): SpecMeasurements {
  return {
    frequencyHz: result.frequencyHz,
    thdPercent: result.thdPercent,
    thd: result.thd,
    harmonics: result.harmonics,
    fundamentalVpk: result.fundamentalVpk,
    inRecordDriftPpm: result.inRecordDrift?.ppm ?? null,
    warnings: result.warnings,
  };
}

describe("rules a capture cannot decide", () => {
  it("a folded 4th harmonic at −25 dBc fails a −35 dBc rule (it used to pass, dropped above Nyquist)", () => {
    const n = 20000;
    const random = new SeededRandom(3);
    const y = Float64Array.from(
      { length: n },
      (_, i) => Math.cos(2 * Math.PI * 0.131 * i) + 10 ** (-25 / 20) * Math.cos(2 * Math.PI * 4 * 0.131 * i + 0.4) + 0.001 * random.normal(),
    );
    const evaluation = evaluateSpec({ maxHarmonicDbc: -35 }, fromResult(analyzeSamples(y, 1e6).result));
    expect(evaluation.verdict).toBe("fail");
    expect(evaluation.checks.find((c) => c.rule === "harmonic-4")).toMatchObject({ outcome: "fail" });
  });

  it("an order that cannot be separated makes its rule and THD 'cannot judge' with sampling advice, and the run inconclusive", () => {
    const y = noisyTone(4096, 0.25, 1, 0.3, 0.001, new SeededRandom(9));
    const evaluation = evaluateSpec({ maxHarmonicDbc: -40, maxThdPercent: 1 }, fromResult(analyzeSamples(y, 4e6).result));
    expect(evaluation.verdict).toBe("inconclusive");
    const thd = evaluation.checks.find((c) => c.rule === "thd");
    expect(thd).toMatchObject({ outcome: "cannot-judge", passed: false });
    expect(thd?.advice).toBe("sample at ≥ 21 MS/s to see every harmonic");
    expect(evaluation.checks.find((c) => c.rule === "harmonic-3")).toMatchObject({ outcome: "cannot-judge" });
  });

  const belowNoise: SpecMeasurements = {
    frequencyHz: 1e6,
    thdPercent: null,
    thd: { status: "below-floor", upperBoundPercent: 0.05, floorPercent: 0.05, note: null, neededSampleRateHz: null },
    harmonics: [{ order: 2, dBc: null, status: "below-detection", detectionLimitDbc: -72 }],
    fundamentalVpk: 1,
    inRecordDriftPpm: null,
    warnings: [],
  };

  it("an undetected order passes only when its detection limit is itself under the limit", () => {
    expect(evaluateSpec({ maxHarmonicDbc: -60 }, belowNoise)).toMatchObject({ verdict: "pass" });
    const strict = evaluateSpec({ maxHarmonicDbc: -80 }, belowNoise);
    expect(strict.verdict).toBe("inconclusive");
    expect(strict.checks[0].message).toMatch(/only tell levels above −?-72\.0 dBc/);
  });

  it("THD under its floor passes a limit above the floor and cannot be judged against one below it", () => {
    expect(evaluateSpec({ maxThdPercent: 0.1 }, belowNoise).verdict).toBe("pass");
    expect(evaluateSpec({ maxThdPercent: 0.01 }, belowNoise).verdict).toBe("inconclusive");
  });

  it("no dominant tone: every numeric rule cannot be judged", () => {
    const evaluation = evaluateSpec(
      { targetHz: 1e6, toleranceValue: 1, toleranceUnit: "percent", minFundamentalVpk: 0.1 },
      { ...belowNoise, warnings: [{ code: "no-dominant-tone", message: "No tone found." }] },
    );
    expect(evaluation.verdict).toBe("inconclusive");
    expect(evaluation.checks.every((c) => c.outcome === "cannot-judge")).toBe(true);
  });

  it("a second mode or a sub-harmonic fails the run like clipping", () => {
    for (const code of ["second-mode", "sub-harmonic"]) {
      expect(evaluateSpec({}, { ...belowNoise, warnings: [{ code, message: "m." }] }).verdict).toBe("fail");
    }
  });
});

describe("the scope's timebase accuracy", () => {
  const base: SpecMeasurements = { frequencyHz: 1_000_030, thdPercent: 1, harmonics: [], fundamentalVpk: 1, inRecordDriftPpm: null, warnings: [] };
  const spec = { targetHz: 1e6, toleranceValue: 50, toleranceUnit: "ppm" as const };

  it("a frequency inside its ±50 ppm window by 20 ppm passes with a 10 ppm timebase and cannot be judged with a 25 ppm one", () => {
    // +30 ppm from target: margin 50 − 30 = 20 ppm.
    expect(evaluateSpec(spec, { ...base, timebasePpm: 10 }).verdict).toBe("pass");
    const judged = evaluateSpec(spec, { ...base, timebasePpm: 25 });
    expect(judged.verdict).toBe("inconclusive");
    expect(judged.checks[0].message).toMatch(/less than the scope's ±25 ppm timebase accuracy/);
  });

  it("a frequency outside by more than the timebase fails, and without a timebase figure the old rule holds", () => {
    expect(evaluateSpec(spec, { ...base, frequencyHz: 1_000_100, timebasePpm: 25 }).verdict).toBe("fail");
    expect(evaluateSpec(spec, base).verdict).toBe("pass");
  });

  it("works in percent windows too: ±0.01 % (100 ppm) inside by 0.001 % (10 ppm) against a 25 ppm timebase", () => {
    const r = evaluateSpec({ targetHz: 1e6, toleranceValue: 0.01, toleranceUnit: "percent" }, { ...base, frequencyHz: 1_000_090, timebasePpm: 25 });
    expect(r.checks[0].outcome).toBe("cannot-judge");
  });
});
