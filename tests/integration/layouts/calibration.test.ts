import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { getBuild } from "@/db/queries/builds";
import { getDesign } from "@/db/queries/designs";
import { buildCalibration, getDesignCalibration } from "@/lib/logbook/layouts";
import { NotFoundError } from "@/lib/errors";
import { logSegments, makeDesign, makeLayoutBuild, makePerson, pF, tag } from "./fixtures";

afterAll(async () => {
  await closeDb();
});

// Closed form, common practice: f0 = 1/(2π√(L·C_total)).
const f0 = (lH: number, cF: number) => 1 / (2 * Math.PI * Math.sqrt(lH * cF));

describe("getDesignCalibration", () => {
  it("adds_the_chosen_construction_s_median_to_the_design", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const revision = `rev ${tag()}`;
    let last = "";
    for (const v of [18, 20, 22]) {
      const fx = await makeLayoutBuild({ owner: engineer, design, revision });
      await logSegments(fx, engineer, [[v], [v]]);
      last = fx.buildId;
    }
    const viewer = await makePerson("viewer");
    const view = await getDesignCalibration(viewer, design.id, { kind: "pcb", revision });
    expect(view.figure?.strength).toBe("thin");
    expect(view.prediction).not.toBeNull();
    // Hand: median of 18, 20, 22 pF is 20 pF; tank L 10 µH, C 1 nF.
    expect(Math.abs(view.prediction!.labCapacitanceF - 20 * pF)).toBeLessThan(1e-6 * pF);
    expect(Math.abs(view.prediction!.asBuilt.predictedHz / f0(10e-6, 1.02e-9) - 1)).toBeLessThan(1e-9);
    expect(view.choices.some((c) => c.key === `pcb:${revision.toLowerCase()}` && c.buildCount === 3)).toBe(true);

    const build = (await getBuild(last))!;
    const onBuild = await buildCalibration(viewer, build, (await getDesign(design.id))!);
    expect(onBuild.constructionKey).toBe(`pcb:${revision.toLowerCase()}`);
    expect(onBuild.prediction?.labCapacitanceF).toBe(view.prediction!.labCapacitanceF);
  });

  it("says_so_when_the_lab_has_no_figure_for_the_construction", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const view = await getDesignCalibration(engineer, design.id, { kind: "pcb", revision: `rev ${tag()}` });
    expect(view.prediction).toBeNull();
    expect(view.error).toMatch(/only the prediction as designed is known/);
  });

  it("an_unknown_design_is_not_found", async () => {
    const viewer = await makePerson("viewer");
    await expect(getDesignCalibration(viewer, "00000000-0000-4000-8000-000000000000", null)).rejects.toBeInstanceOf(NotFoundError);
  });
});
