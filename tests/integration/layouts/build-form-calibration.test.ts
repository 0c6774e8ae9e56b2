import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { getDesign } from "@/db/queries/designs";
import { designCalibrationsByConstruction } from "@/lib/logbook/layouts";
import { logSegments, makeDesign, makeLayoutBuild, makePerson, pF, tag } from "./fixtures";

afterAll(async () => {
  await closeDb();
});

// Closed form, common practice: f0 = 1/(2π√(L·C_total)); the fixtures' tank is L 10 µH, C 1 nF.
const f0 = (lH: number, cF: number) => 1 / (2 * Math.PI * Math.sqrt(lH * cF));

describe("designCalibrationsByConstruction", () => {
  it("gives_the_new_build_form_both_predictions_for_each_construction_with_a_figure", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const revision = `Rev ${tag()}`;
    for (const v of [20, 24, 22]) {
      const fx = await makeLayoutBuild({ owner: engineer, design, revision });
      await logSegments(fx, engineer, [[v], [v]]);
    }
    const technician = await makePerson("technician");
    const calibration = await designCalibrationsByConstruction(technician, (await getDesign(design.id))!);
    expect(calibration.error).toBeNull();
    expect(Math.abs(calibration.asDesigned!.predictedHz / f0(10e-6, 1e-9) - 1)).toBeLessThan(1e-12);
    // The worst-case band holds the nominal: L and C ±5 % each.
    expect(calibration.asDesigned!.worstCase.minHz).toBeLessThan(calibration.asDesigned!.predictedHz);
    expect(calibration.asDesigned!.worstCase.maxHz).toBeGreaterThan(calibration.asDesigned!.predictedHz);

    // The form looks the view up by the key of what is typed: revisions compare without regard to case.
    const view = calibration.views.find((v) => v.constructionKey === `pcb:${revision.toLowerCase()}`)!;
    expect(view).toBeDefined();
    // Hand: builds at 20, 22, 24 pF → median 22 pF, taken in parallel with the 1 nF.
    expect(Math.abs(view.prediction!.asBuilt.predictedHz / f0(10e-6, 1e-9 + 22 * pF) - 1)).toBeLessThan(1e-9);
    expect(view.prediction!.asDesigned.predictedHz).toBeCloseTo(calibration.asDesigned!.predictedHz, 6);
    // Every view is one the lab has a figure for; no figure, no view.
    expect(calibration.views.every((v) => v.figure !== null && v.prediction !== null)).toBe(true);
  });
});
