import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { listLayoutGroups } from "@/db/queries/layouts";
import { classifyImpliedCapacitanceTrend } from "@/lib/drift-trend";
import { listLayoutFigures } from "@/lib/logbook/layouts";
import { UnauthorizedError } from "@/lib/errors";
import { frequencyWithExtra, logAnalysedRun, logSegments, logTweak, makeDesign, makeLayoutBuild, makePerson, pF, tag } from "./fixtures";

afterAll(async () => {
  await closeDb();
});

async function groupFor(revision: string) {
  const groups = await listLayoutGroups({ kind: "pcb" });
  return groups.find((g) => g.kindRevision.toLowerCase() === revision.toLowerCase()) ?? null;
}

describe("listLayoutGroups", () => {
  it("keeps_steady_builds_and_counts_the_others_as_candidates", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const revision = `rev ${tag()}`;
    const plan: Record<string, number[][]> = {
      steadyA: [[12, 12.3], [12.1, 12.4]],
      steadyB: [[14, 14.2], [14.1]],
      steadyC: [[9.8], [10.1], [10]],
      changing: [[10, 10.2], [30, 30.1]],
      untested: [[11, 11.2, 11.1]],
      single: [[12]],
    };
    const ids: Record<string, string> = {};
    for (const [name, segments] of Object.entries(plan)) {
      const fx = await makeLayoutBuild({ owner: engineer, design, revision, label: name });
      ids[name] = fx.buildId;
      await logSegments(fx, engineer, segments);
    }
    const group = await groupFor(revision);
    expect(group).not.toBeNull();
    expect(group!.topology).toBe("tank");
    expect(group!.candidateBuildCount).toBe(6);
    expect(group!.steadyBuilds.map((b) => b.label)).toEqual(["steadyC", "steadyA", "steadyB"]);

    // The SQL rule agrees with lib/drift-trend's classifier on every build, steady or not.
    for (const [name, segments] of Object.entries(plan)) {
      const trend = classifyImpliedCapacitanceTrend(segments.flatMap((values, segment) => values.map((v) => ({ impliedExtraCapacitanceF: v * pF, uncertaintyF: null, segment }))));
      const steady = group!.steadyBuilds.find((b) => b.buildId === ids[name]);
      expect(Boolean(steady), `${name}: ${trend.verdict}`).toBe(trend.verdict === "steady");
      if (steady) {
        // Hand: steadyA segment means 12.15 and 12.25 pF → typical 12.2 pF, spread 0.1 pF.
        expect(steady.typicalF).toBeCloseTo(trend.typicalF!, 18);
        expect(steady.spreadF).toBeCloseTo(trend.spreadF, 18);
        expect(steady.segmentCount).toBe(segments.length);
        expect(steady.runCount).toBe(segments.flat().length);
      }
    }
    const a = group!.steadyBuilds.find((b) => b.label === "steadyA")!;
    expect(Math.abs(a.typicalF - 12.2 * pF)).toBeLessThan(1e-6 * pF);
    expect(a.designId).toBe(design.id);
  });

  it("leaves_out_runs_with_trust_warnings", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const revision = `rev ${tag()}`;
    const fx = await makeLayoutBuild({ owner: engineer, design, revision, label: "warned-later" });
    await logSegments(fx, engineer, [[15, 15.1]]);
    await logTweak(fx, engineer);
    await logAnalysedRun(fx, engineer, 15.2 * pF);
    // Clipped and few-cycle captures after another tweak would make the trend "changing" if they counted.
    await logTweak(fx, engineer);
    await logAnalysedRun(fx, engineer, 60 * pF, { warnings: ["clipping"] });
    await logAnalysedRun(fx, engineer, 55 * pF, { warnings: ["few-cycles", "not-steady"] });

    const group = await groupFor(revision);
    expect(group!.candidateBuildCount).toBe(1);
    expect(group!.steadyBuilds).toHaveLength(1);
    const build = group!.steadyBuilds[0];
    expect(build.runCount).toBe(3);
    expect(build.segmentCount).toBe(2);
    expect(Math.abs(build.typicalF - (15.05 + 15.2) / 2 * pF)).toBeLessThan(1e-6 * pF);
  });

  it("a_build_with_only_warned_runs_is_no_candidate", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const revision = `rev ${tag()}`;
    const fx = await makeLayoutBuild({ owner: engineer, design, revision });
    await logAnalysedRun(fx, engineer, 20 * pF, { warnings: ["clipping"] });
    await logTweak(fx, engineer);
    await logAnalysedRun(fx, engineer, 20 * pF, { warnings: ["clipping"] });
    expect(await groupFor(revision)).toBeNull();
  });

  it("planned_tweaks_do_not_split_segments", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const revision = `rev ${tag()}`;
    const fx = await makeLayoutBuild({ owner: engineer, design, revision });
    await logAnalysedRun(fx, engineer, 8 * pF);
    await logTweak(fx, engineer, true);
    await logAnalysedRun(fx, engineer, 8.1 * pF);
    // Two runs, one segment: untested, not steady.
    const group = await groupFor(revision);
    expect(group!.candidateBuildCount).toBe(1);
    expect(group!.steadyBuilds).toHaveLength(0);
  });

  it("gives_the_inductance_error_of_a_build_that_runs_above_its_prediction", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const revision = `rev ${tag()}`;
    const fx = await makeLayoutBuild({ owner: engineer, design, revision });
    await logSegments(fx, engineer, [[-20, -20.1], [-20.05]]);
    const build = (await groupFor(revision))!.steadyBuilds[0];
    expect(build.typicalF).toBeLessThan(0);
    // Hand: each run's ΔL/L = (f_pred/f_meas)² − 1 = (C_eff + C_x)/C_eff − 1 = C_x/C_eff, so the mean is the mean C_x / 1 nF.
    const expected = ((-20 - 20.1 - 20.05) / 3) * pF / 1e-9;
    expect(Math.abs(build.inductanceErrorFraction! - expected)).toBeLessThan(1e-9);
    const pred = fx.snapshot.predictedHz!;
    const meas = frequencyWithExtra(fx.snapshot.lEffH!, fx.snapshot.cEffF!, -20 * pF);
    expect(meas).toBeGreaterThan(pred);
  });

  it("filters_by_kind_and_topology", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const revision = `rev ${tag()}`;
    const fx = await makeLayoutBuild({ owner: engineer, design, revision });
    await logSegments(fx, engineer, [[5], [5.1]]);
    const byTopology = await listLayoutGroups({ kind: "pcb", topology: "colpitts" });
    expect(byTopology.some((g) => g.kindRevision === revision)).toBe(false);
    const tank = await listLayoutGroups({ kind: "pcb", topology: "tank" });
    expect(tank.some((g) => g.kindRevision === revision)).toBe(true);
    const breadboards = await listLayoutGroups({ kind: "breadboard" });
    expect(breadboards.every((g) => g.kind === "breadboard")).toBe(true);
  });

  it("runs_as_one_statement", async () => {
    const statements: string[] = [];
    const listener = (q: { sql: string }) => statements.push(q.sql);
    db().on("query", listener);
    try {
      await listLayoutGroups();
    } finally {
      db().off("query", listener);
    }
    expect(statements).toHaveLength(1);
  });
});

describe("listLayoutFigures", () => {
  it("computes_the_robust_figure_over_the_steady_builds", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const revision = `rev ${tag()}`;
    for (const value of [10, 11, 12, 13, 40]) {
      const fx = await makeLayoutBuild({ owner: engineer, design, revision });
      await logSegments(fx, engineer, [[value], [value]]);
    }
    const viewer = await makePerson("viewer");
    const figures = await listLayoutFigures(viewer, { kind: "pcb", topology: "tank" });
    const figure = figures.find((f) => f.construction.revision === revision)!;
    expect(figure.strength).toBe("trusted");
    expect(figure.constructionName).toBe(`PCB ${revision}`);
    // Hand: median 12 pF; |x − 12| = 2, 1, 0, 1, 28 → MAD 1 pF; scaled 1.4826 pF; range 30 pF.
    expect(figure.capacitanceF.count).toBe(5);
    expect(Math.abs(figure.capacitanceF.median! - 12 * pF)).toBeLessThan(1e-6 * pF);
    expect(Math.abs(figure.capacitanceF.scaledMad! - 1.4826 * pF)).toBeLessThan(1e-6 * pF);
    expect(Math.abs(figure.capacitanceF.range! - 30 * pF)).toBeLessThan(1e-6 * pF);
    expect(figure.inductanceErrorFraction.count).toBe(0);
  });

  it("refuses_without_a_user", async () => {
    await expect(listLayoutFigures(null)).rejects.toBeInstanceOf(UnauthorizedError);
  });
});
