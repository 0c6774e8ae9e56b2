import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { getRetuneSuggestion, planRetuneTweak } from "@/lib/logbook/review";
import { chooseRetuneAim, retuneAimFor } from "@/lib/logbook/retune-aim";
import { BadRequestError } from "@/lib/errors";
import { logAnalysedRun, logSegments, makeDesign, makeLayoutBuild, makePerson, pF, tag, type LayoutBuildFixture } from "./fixtures";

afterAll(async () => {
  await closeDb();
});

// Closed form, common practice: f0 = 1/(2π√(L·C_total)); the fixtures' tank is L 10 µH, C 1 nF.
const f0 = (lH: number, cF: number) => 1 / (2 * Math.PI * Math.sqrt(lH * cF));

/** A build whose runs are judged against a 1.5 MHz target (the snapshot carries the spec). */
async function targetBuild(fx: LayoutBuildFixture): Promise<LayoutBuildFixture> {
  fx.snapshot = { ...fx.snapshot, spec: { targetHz: 1.5e6 } };
  return fx;
}

describe("the retune card's aim, remembered per person", () => {
  it("aims_with_the_build_s_run_by_default_and_with_the_lab_s_figure_once_chosen", async () => {
    const engineer = await makePerson("engineer");
    const design = await makeDesign(engineer);
    const revision = `rev ${tag()}`;
    for (const v of [20, 22, 24]) {
      const fx = await makeLayoutBuild({ owner: engineer, design, revision });
      await logSegments(fx, engineer, [[v], [v]]);
    }
    // One run only: too few to be steady, so it never moves the lab's figure.
    const build = await targetBuild(await makeLayoutBuild({ owner: engineer, design, revision, label: "target" }));
    await logAnalysedRun(build, engineer, 5 * pF);
    const technician = await makePerson("technician");
    const buildRow = { kind: "pcb" as const, kindRevision: revision };

    const measured = await retuneAimFor(technician, buildRow, "tank");
    expect(measured).toMatchObject({ aim: "measured", calibrationCapacitanceF: undefined, fallbackReason: null });
    const own = (await getRetuneSuggestion(build.buildId, { calibrationCapacitanceF: measured.calibrationCapacitanceF }))!.suggestion;
    expect(own.calibrationCapacitanceF / (5 * pF) - 1).toBeCloseTo(0, 6);

    await chooseRetuneAim(technician, "lab");
    const lab = await retuneAimFor(technician, buildRow, "tank");
    // Hand: the three PCBs hold 20, 22, 24 pF → median 22 pF.
    expect(lab.aim).toBe("lab");
    expect(lab.calibrationCapacitanceF! / (22 * pF) - 1).toBeCloseTo(0, 9);
    const aimed = (await getRetuneSuggestion(build.buildId, { calibrationCapacitanceF: lab.calibrationCapacitanceF }))!.suggestion;
    expect(aimed.predictedHz / f0(10e-6, aimed.toSi + 22 * pF) - 1).toBeCloseTo(0, 9);
    expect(aimed.idealSi!).toBeLessThan(own.idealSi!);

    // The planned tweak is the one the card shows with that aim.
    const { tweak } = await planRetuneTweak(technician, { buildId: build.buildId, calibrationCapacitanceF: lab.calibrationCapacitanceF }, { ip: null });
    expect(tweak.planned).toBe(true);
    expect(tweak.toValue).toBe(aimed.toSi);

    // Another person keeps the default.
    expect((await retuneAimFor(await makePerson("viewer"), buildRow, "tank")).aim).toBe("measured");
  });

  it("falls_back_to_the_build_s_run_with_the_reason_when_the_lab_has_no_figure", async () => {
    const person = await makePerson("technician");
    await chooseRetuneAim(person, "lab");
    const view = await retuneAimFor(person, { kind: "pcb", kindRevision: `rev none ${tag()}` }, "tank");
    expect(view.calibrationCapacitanceF).toBeUndefined();
    expect(view.fallbackReason).toMatch(/no steady PCB rev none .* build of this topology yet/i);
  });

  it("refuses_an_aim_it_does_not_know", async () => {
    const person = await makePerson("viewer");
    await expect(chooseRetuneAim(person, "guess")).rejects.toBeInstanceOf(BadRequestError);
    await expect(chooseRetuneAim(null, "lab")).rejects.toThrow(/Sign in/);
  });
});
