import { describe, expect, it } from "vitest";
import type { LayoutGroupRows, SteadyLayoutBuild } from "@/db/queries/layouts";
import { MIN_BUILDS_FOR_TRUST, figureStrength, findLayoutFigure, layoutFigures } from "@/lib/layouts/layout-figures";

const pF = 1e-12;

function build(typicalPf: number, lError: number | null = null): SteadyLayoutBuild {
  return {
    buildId: `b-${typicalPf}`,
    label: `B ${typicalPf}`,
    designId: "d",
    designName: "D",
    projectId: "p",
    projectName: "P",
    typicalF: typicalPf * pF,
    spreadF: 0.1 * pF,
    runCount: 3,
    segmentCount: 2,
    inductanceErrorFraction: lError,
  };
}

describe("figureStrength", () => {
  it("trusts_from_the_threshold_up", () => {
    expect(MIN_BUILDS_FOR_TRUST).toBe(5);
    expect(figureStrength(5)).toBe("trusted");
    expect(figureStrength(4)).toBe("thin");
    expect(figureStrength(1)).toBe("thin");
    expect(figureStrength(0)).toBe("none");
  });
});

describe("layoutFigures", () => {
  const groups: LayoutGroupRows[] = [
    { kind: "pcb", kindRevision: "rev A", topology: "colpitts", candidateBuildCount: 3, steadyBuilds: [build(3), build(-2, -0.004)] },
    { kind: "breadboard", kindRevision: "", topology: "colpitts", candidateBuildCount: 7, steadyBuilds: [8, 9, 10, 11, 30].map((v) => build(v)) },
  ];

  it("summarises_each_group_robustly_and_puts_the_best_backed_first", () => {
    const figures = layoutFigures(groups);
    expect(figures.map((f) => f.constructionKey)).toEqual(["breadboard", "pcb:rev a"]);
    const bb = figures[0];
    expect(bb.strength).toBe("trusted");
    // Hand: median 10 pF; |x − 10| = 2, 1, 0, 1, 20 → MAD 1 pF → scaled 1.4826 pF.
    expect(bb.capacitanceF.median! / pF).toBeCloseTo(10, 9);
    expect(bb.capacitanceF.scaledMad! / pF).toBeCloseTo(1.4826, 9);
    expect(bb.candidateBuildCount).toBe(7);
  });

  it("gives_the_inductance_figure_only_for_builds_that_run_above_their_prediction", () => {
    const pcb = layoutFigures(groups)[1];
    expect(pcb.strength).toBe("thin");
    expect(pcb.inductanceErrorFraction.count).toBe(1);
    expect(pcb.inductanceErrorFraction.median).toBe(-0.004);
    expect(pcb.capacitanceF.count).toBe(2);
  });

  it("finds_a_figure_by_construction_and_topology", () => {
    const figures = layoutFigures(groups);
    expect(findLayoutFigure(figures, { kind: "pcb", revision: "REV A" }, "colpitts")?.constructionName).toBe("PCB rev A");
    expect(findLayoutFigure(figures, { kind: "pcb", revision: "rev A" }, "hartley")).toBeNull();
  });
});
