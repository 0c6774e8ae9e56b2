import { describe, expect, it } from "vitest";
import type { CompareRows } from "@/db/queries/layouts";
import { chosenRunsProblem, compareBuilds, readCompareStability } from "@/lib/layouts/build-comparison";

const pF = 1e-12;
const build = (id: string) => ({
  id,
  label: id,
  kind: "pcb" as const,
  kindRevision: "rev A",
  status: "open",
  designId: "d",
  designName: "D",
  topology: "tank" as const,
  projectId: "p",
  projectName: "P",
});
const at = (minute: number) => new Date(Date.UTC(2026, 11, 1, 9, minute));
const run = (id: string, buildId: string, minute: number, impliedPf: number, withdrawn = false) => ({
  id,
  buildId,
  createdAt: at(minute),
  originalFilename: `${id}.csv`,
  withdrawn,
  impliedExtraCapacitanceF: impliedPf * pF,
  cEffF: 1e-9,
  measuredHz: 1.5e6,
  frequencyUncertaintyHz: 0.5,
});

describe("readCompareStability", () => {
  it("says_not_measured_with_a_reason_when_the_analysis_holds_no_stability", () => {
    for (const stored of [null, undefined, 0, "x", []]) {
      const s = readCompareStability(stored);
      expect(s).toMatchObject({ measured: false, rmsJitterS: null, phaseNoise: [], allan: [] });
      expect(s.reason).toMatch(/not measured/);
    }
  });

  it("keeps_finite_points_sorted_and_the_engine_s_reason_for_a_missing_jitter", () => {
    const s = readCompareStability({
      jitter: { rmsJitterS: null, reason: "record shorter than 10 periods" },
      phaseNoise: { points: [{ offsetHz: 1e4, dbcPerHz: -130, atFloor: true }, { offsetHz: 1e3, dbcPerHz: -110 }, { offsetHz: -1, dbcPerHz: -90 }, { offsetHz: 1e5, dbcPerHz: Number.NaN }] },
      allan: { points: [{ tauS: 1e-3, adev: 2e-8 }, { tauS: 1e-4, adev: 5e-8 }, { tauS: 0, adev: 1 }, "junk"] },
    });
    expect(s.measured).toBe(true);
    expect(s.rmsJitterS).toBeNull();
    expect(s.jitterReason).toBe("record shorter than 10 periods");
    expect(s.phaseNoise).toEqual([{ offsetHz: 1e3, dbcPerHz: -110, atFloor: false }, { offsetHz: 1e4, dbcPerHz: -130, atFloor: true }]);
    expect(s.allan).toEqual([{ tauS: 1e-4, adev: 5e-8 }, { tauS: 1e-3, adev: 2e-8 }]);
  });
});

describe("chosenRunsProblem", () => {
  const runs = [run("a1", "A", 1, 10), run("a2", "A", 2, 10), run("b1", "B", 3, 12)];
  it("accepts_one_run_per_build_and_none", () => {
    expect(chosenRunsProblem(runs, [])).toBeNull();
    expect(chosenRunsProblem(runs, ["a1", "b1"])).toBeNull();
  });
  it("refuses_a_foreign_run_and_two_runs_of_one_build", () => {
    expect(chosenRunsProblem(runs, ["zz"])).toMatch(/zz is not an analysed run/);
    expect(chosenRunsProblem(runs, ["a1", "a2"])).toMatch(/at most one run per build/);
  });
});

describe("compareBuilds", () => {
  it("leaves_withdrawn_runs_out_of_the_trend_and_the_count_but_offers_them_for_choosing", () => {
    const rows: CompareRows = {
      builds: [build("A")],
      // Segment 0 steady at 10 pF; a withdrawn 40 pF run that would make it change.
      trendRuns: [run("a1", "A", 1, 10), run("a2", "A", 2, 10.1), run("a3", "A", 4, 10), run("a4", "A", 5, 40, true)],
      tweaks: [{ id: "t", buildId: "A", createdAt: at(3), partRef: null, planned: false }],
      latestRuns: [],
    };
    const [a] = compareBuilds(rows, ["A"]);
    expect(a.runCount).toBe(3);
    expect(a.trend.verdict).toBe("steady");
    expect(a.runChoices.map((r) => [r.id, r.withdrawn])).toEqual([["a4", true], ["a3", false], ["a2", false], ["a1", false]]);
    expect(a.latestRun).toBeNull();
    expect(a.stability.measured).toBe(false);
  });
});
