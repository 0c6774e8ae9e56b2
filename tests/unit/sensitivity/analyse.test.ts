import { describe, expect, it } from "vitest";
import { analyseSensitivity, predictTempco, type MeasuredSlope, type SensitivityRunInput, type SlopeFigure } from "@/lib/sensitivity";
import { groupRunsByTweaks, repeatRuns } from "@/lib/sensitivity/groups";
import { weightedLinearFit } from "@/lib/sensitivity/weighted-fit";
import type { OscillatorDesign } from "@/lib/oscillator/design";

const F0 = 400_000;
const T0 = Date.parse("2026-11-01T08:00:00Z");
const design: OscillatorDesign = {
  topology: "colpitts",
  parts: { L: { valueSi: 100e-6, tempcoPpmPerK: 60 }, C1: { valueSi: 2.2e-9, tempcoPpmPerK: 0 }, C2: { valueSi: 12e-9, tempcoPpmPerK: 0 } },
};

let n = 0;
function run(minute: number, fields: Partial<SensitivityRunInput> & { supplyV: number | null; temperatureC: number | null }): SensitivityRunInput {
  n++;
  return {
    id: `00000000-0000-4000-8000-${String(n).padStart(12, "0")}`,
    createdAt: new Date(T0 + minute * 60_000),
    originalFilename: `run-${n}.csv`,
    measuredHz: F0,
    frequencyUncertaintyHz: 0.5,
    fundamentalVpk: 1,
    warningCodes: [],
    design,
    ...fields,
  };
}

function measured(figure: SlopeFigure): MeasuredSlope {
  expect(figure.measured, figure.measured ? "" : (figure as { reason: string }).reason).toBe(true);
  return figure as MeasuredSlope;
}

/** Planted −50 ppm/V about 12 V and −30 ppm/K about 25 °C, plus a fixed small offset pattern. */
function planted(supplyV: number, temperatureC: number, offsetHz = 0): number {
  return F0 * (1 - 50e-6 * (supplyV - 12) - 30e-6 * (temperatureC - 25)) + offsetHz;
}

describe("analyseSensitivity", () => {
  it("recovers planted pushing and tempco from runs that vary supply and temperature separately (each held in the fit)", () => {
    const conditions: [number, number][] = [
      [9, 25],
      [10.5, 25],
      [12, 25],
      [13.5, 25],
      [15, 25],
      [12, 15],
      [12, 35],
      [12, 45],
    ];
    const runs = conditions.map(([v, t], i) => run(i * 10, { supplyV: v, temperatureC: t, measuredHz: planted(v, t), fundamentalVpk: 0.1 * v + 0.01 * (i % 2) }));
    const report = analyseSensitivity(runs, []);
    expect(report.groups).toHaveLength(1);
    const pushing = measured(report.groups[0].pushing);
    const tempco = measured(report.groups[0].tempco);
    expect(pushing.runs).toBe(8);
    expect(pushing.heldConstant).toEqual(["temperature"]);
    // The relative slope is against the fitted frequency at the mean condition, not F0 exactly.
    expect(pushing.ppm!).toBeCloseTo((-50e-6 * F0 * 1e6) / pushing.intercept, 6);
    expect(tempco.ppm!).toBeCloseTo((-30e-6 * F0 * 1e6) / tempco.intercept, 6);
    expect(pushing.slope).toBeCloseTo(-20, 6); // −50 ppm/V of 400 kHz
    // Exact line: χ² ≈ 0, so σ comes from the stated 0.5 Hz alone.
    expect(pushing.sigmaBasis).toBe("stated");
    const amplitude = measured(report.groups[0].amplitudePushing);
    expect(amplitude.slope).toBeCloseTo(0.1, 2);
    expect(amplitude.sigmaBasis).toBe("scatter");
  });

  it("gives the 1-regressor fit's slope and σ from the closed form when only supply varies", () => {
    const supplies = [9, 10, 11, 12, 13];
    const offsets = [0.3, -0.2, 0.1, -0.4, 0.2];
    const runs = supplies.map((v, i) => run(i, { supplyV: v, temperatureC: 23, measuredHz: planted(v, 25) + offsets[i], frequencyUncertaintyHz: 0.25 }));
    const pushing = measured(analyseSensitivity(runs, []).groups[0].pushing);
    const direct = weightedLinearFit(runs.map((r) => ({ y: r.measuredHz!, sigma: 0.25, x: [r.supplyV!] })));
    expect(pushing.slope).toBeCloseTo(direct.coefficients[1], 9);
    // Equal σ: σ_b = σ/√Σ(x−x̄)² = 0.25/√10, widened by √χ²ν when the scatter exceeds it.
    const scale = Math.max(1, Math.sqrt(direct.reducedChiSquare!));
    expect(pushing.slopeSigma).toBeCloseTo((0.25 / Math.sqrt(10)) * scale, 9);
    expect(pushing.sigmaBasis).toBe(scale > 1 ? "stated-and-scatter" : "stated");
    const tempco = analyseSensitivity(runs, []).groups[0].tempco;
    expect(tempco).toEqual({ measured: false, reason: expect.stringMatching(/no spread.*23 °C/) });
  });

  it("says not measured below 3 runs and when no run records a supply", () => {
    const two = [run(0, { supplyV: 9, temperatureC: null }), run(1, { supplyV: 12, temperatureC: null })];
    const report = analyseSensitivity(two, []);
    expect(report.groups[0].pushing).toEqual({ measured: false, reason: expect.stringMatching(/2 runs have a supply voltage; the fit needs at least 3/) });
    expect(report.groups[0].tempco).toEqual({ measured: false, reason: expect.stringMatching(/no run of this build state records its temperature/) });
  });

  it("never mixes build states: a part tweak starts a new group, a note-only tweak does not", () => {
    const before = [9, 12, 15].map((v, i) => run(i, { supplyV: v, temperatureC: 25, measuredHz: planted(v, 25) }));
    // After C2 changed the frequency is 2 % lower and the pushing is different (−100 ppm/V).
    const after = [9, 12, 15].map((v, i) => run(100 + i, { supplyV: v, temperatureC: 25, measuredHz: 0.98 * F0 * (1 - 100e-6 * (v - 12)) }));
    const tweaks = [
      { id: "t-note", createdAt: new Date(T0 + 1.5 * 60_000), partRef: null, planned: false },
      { id: "t-part", createdAt: new Date(T0 + 50 * 60_000), partRef: "C2", planned: false },
      { id: "t-planned", createdAt: new Date(T0 + 101.5 * 60_000), partRef: "C1", planned: true },
    ];
    const report = analyseSensitivity([...after, ...before], tweaks);
    expect(report.groups.map((g) => g.runIds)).toEqual([before.map((r) => r.id), after.map((r) => r.id)]);
    expect(measured(report.groups[0].pushing).ppm).toBeCloseTo(-50, 1);
    expect(measured(report.groups[1].pushing).ppm).toBeCloseTo(-100, 1);
    expect(report.currentGroupIndex).toBe(1);
    // Mixing both states would have given neither slope.
    const mixed = weightedLinearFit([...before, ...after].map((r) => ({ y: r.measuredHz!, sigma: 0.5, x: [r.supplyV!] })));
    expect(Math.abs((mixed.coefficients[1] / F0) * 1e6 + 100)).toBeGreaterThan(5);
  });

  it("excludes runs whose frequency is unjudgeable, saying why", () => {
    const runs = [
      run(0, { supplyV: 12, temperatureC: 25, warningCodes: ["second-mode"] }),
      run(1, { supplyV: 12, temperatureC: 25, measuredHz: null }),
      run(2, { supplyV: 12, temperatureC: 25, frequencyUncertaintyHz: null }),
      run(3, { supplyV: 12, temperatureC: 25, warningCodes: ["clipping"] }),
    ];
    const report = analyseSensitivity(runs, []);
    expect(report.excluded.map((e) => e.reason)).toEqual([
      expect.stringMatching(/second-mode/),
      "no measured frequency",
      expect.stringMatching(/no frequency uncertainty/),
    ]);
    expect(report.groups[0].runIds).toEqual([runs[3].id]);
  });
});

describe("run-to-run stability", () => {
  const at = (v: number, t: number, hz: number, minute: number) => run(minute, { supplyV: v, temperatureC: t, measuredHz: hz, frequencyUncertaintyHz: 0.5 });

  it("passes scatter the stated uncertainties explain and flags scatter they do not (χ² at the 1 % level)", () => {
    // Quiet: deviations ±0.5 Hz with σ 0.5 Hz → χ² = 4·(1² ·…) small. Noisy: ±5 Hz → χ² in the hundreds.
    const quiet = [0.4, -0.3, 0.5, -0.6].map((d, i) => at(12, 25, F0 + d, i * 10));
    const noisy = [5, -4, 6, -5].map((d, i) => at(9, 25, F0 + d, i * 10 + 5));
    const report = analyseSensitivity([...quiet, ...noisy], []);
    const [q, z] = [report.repeatSets.find((s) => s.supplyV === 12)!, report.repeatSets.find((s) => s.supplyV === 9)!];
    expect(q.runs).toBe(4);
    expect(q.flagged).toBe(false);
    expect(q.pValue!).toBeGreaterThan(0.01);
    expect(z.flagged).toBe(true);
    expect(z.pValue!).toBeLessThan(0.01);
    // Hand check of the quiet set: equal weights → mean = F0 + 0 (the deviations sum to 0).
    expect(q.meanHz).toBeCloseTo(F0, 9);
    expect(q.chiSquare).toBeCloseTo((0.16 + 0.09 + 0.25 + 0.36) / 0.25, 9);
    // Allan deviation of y = d/F0: ½·mean of squared successive differences (0.7², 0.8², 1.1²)/F0².
    expect(q.allanDeviation!).toBeCloseTo(Math.sqrt((0.49 + 0.64 + 1.21) / 3 / 2) / F0, 12);
    expect(q.expectedAllanDeviation!).toBeCloseTo(0.5 / F0, 12);
    expect(q.tauS).toBe(600);
  });

  it("starts a new set after any tweak, and says a set of two cannot be tested", () => {
    const runs = [at(12, 25, F0, 0), at(12, 25, F0 + 10, 1), at(12, 25, F0 - 10, 2), at(12, 25, F0 + 30, 3)];
    const report = analyseSensitivity(runs, [{ id: "t", createdAt: new Date(T0 + 1.5 * 60_000), partRef: null, planned: false }]);
    expect(report.repeatSets.map((s) => s.runs)).toEqual([2, 2]);
    expect(report.repeatSets.every((s) => !s.flagged && s.reason?.includes("at least 3"))).toBe(true);
  });

  it("keeps runs at another condition in between from breaking a set", () => {
    const runs = [at(12, 25, F0, 0), at(9, 25, F0, 1), at(12.02, 25.3, F0, 2), at(12, 26, F0, 3)];
    const sets = repeatRuns(runs, 0.05, 0.5);
    expect(sets.map((s) => s.length)).toEqual([2, 1, 1]);
  });
});

describe("groupRunsByTweaks", () => {
  it("puts a tweak before the first run at or after it, like the timeline", () => {
    const a = run(0, { supplyV: 12, temperatureC: 25 });
    const b = run(10, { supplyV: 12, temperatureC: 25 });
    const groups = groupRunsByTweaks([b, a], [{ id: "t", createdAt: new Date(T0 + 10 * 60_000), partRef: "L", planned: false }], "part");
    expect(groups.map((g) => g.map((r) => r.id))).toEqual([[a.id], [b.id]]);
  });
});

describe("predictTempco", () => {
  it("gives −½ of L's tempco for a Colpitts whose capacitors do not move (f ∝ L^−½)", () => {
    const p = predictTempco(design);
    expect(p.predicted).toBe(true);
    if (p.predicted) expect(p.ppmPerK).toBeCloseTo(-30, 2);
  });

  it("says why when no part has a tempco", () => {
    expect(predictTempco({ topology: "tank", parts: { L: { valueSi: 1e-6 }, C: { valueSi: 1e-9 } } })).toEqual({ predicted: false, reason: "no part of the design has a tempco entered" });
  });
});
