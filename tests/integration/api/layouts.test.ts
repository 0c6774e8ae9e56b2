import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { buildComparisonSchema, calibratedPredictionSchema, layoutFigureListSchema } from "@/lib/openapi/schemas/layouts";
import { logAnalysedRun, logSegments, makeDesign, makeLayoutBuild, makePerson, pF, tag, type LayoutBuildFixture } from "../layouts/fixtures";
import { api, createRoleTeam, expectDocumented, expectProblem, roles, type ApiPerson, type Role } from "./helpers";

// Reads of the lab's figures, the calibrated prediction and the comparison, through API tokens, for every role.
// Each is a read: every signed-in role may call it, nobody without credentials.

// Closed form, common practice: f0 = 1/(2π√(L·C_total)); the fixtures' tank is L 10 µH, C 1 nF.
const f0 = (lH: number, cF: number) => 1 / (2 * Math.PI * Math.sqrt(lH * cF));

let team: Record<Role, ApiPerson>;
let revision: string;
let designId: string;
let builds: LayoutBuildFixture[] = [];

beforeAll(async () => {
  team = await createRoleTeam("layouts");
  const engineer = await makePerson("engineer");
  const design = await makeDesign(engineer);
  designId = design.id;
  revision = `rev ${tag()}`;
  builds = [];
  for (const v of [9, 10, 11, 12, 13]) {
    const fx = await makeLayoutBuild({ owner: engineer, design, revision, label: `PCB-${v}` });
    await logSegments(fx, engineer, [[v, v + 0.1], [v]]);
    builds.push(fx);
  }
  // A clipped capture as the newest run of the last build: it shows in the comparison, not in the figure.
  await logAnalysedRun(builds[4], engineer, 80 * pF, { warnings: ["clipping"], thdPercent: 4.2 });
}, 120_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

const construction = () => encodeURIComponent(`pcb:${revision}`);

describe("GET /api/v1/layouts", () => {
  it.each(roles)("answers_the_%s_role_with_the_documented_figures", async (role) => {
    const res = await api("get", "/api/v1/layouts?kind=pcb&topology=tank", team[role]);
    expect(res.status, res.text).toBe(200);
    const body = expectDocumented(layoutFigureListSchema, res.body);
    const figure = body.items.find((f) => f.construction.revision === revision)!;
    expect(figure.strength).toBe("trusted");
    expect(figure.builds.map((b) => b.label)).toEqual(["PCB-9", "PCB-10", "PCB-11", "PCB-12", "PCB-13"]);
    // Hand: segment means v + 0.05 and v, so build values 9.025, 10.025, 11.025, 12.025, 13.025 pF → median 11.025 pF;
    // |x − median| = 2, 1, 0, 1, 2 → MAD 1 pF → scaled 1.4826 pF.
    expect(Math.abs(figure.capacitanceF.median! - 11.025 * pF)).toBeLessThan(1e-6 * pF);
    expect(Math.abs(figure.capacitanceF.scaledMad! - 1.4826 * pF)).toBeLessThan(1e-6 * pF);
    expect(body.items.every((f) => f.construction.kind === "pcb" && f.topology === "tank")).toBe(true);
  });

  it("refuses_without_credentials", async () => {
    expectProblem(await api("get", "/api/v1/layouts", null), 401);
  });

  it("refuses_an_unknown_kind_with_the_field_named", async () => {
    const problem = expectProblem(await api("get", "/api/v1/layouts?kind=veroboard", team.viewer), 400);
    expect(problem.fields?.kind?.[0]).toMatch(/breadboard, perfboard, pcb, other/);
  });
});

describe("GET /api/v1/designs/{designId}/prediction", () => {
  it.each(roles)("gives_the_%s_role_both_predictions", async (role) => {
    const res = await api("get", `/api/v1/designs/${designId}/prediction?construction=${construction()}`, team[role]);
    expect(res.status, res.text).toBe(200);
    const body = expectDocumented(calibratedPredictionSchema, res.body);
    expect(body.construction.key).toBe(`pcb:${revision.toLowerCase()}`);
    expect(Math.abs(body.asDesigned!.predictedHz / f0(10e-6, 1e-9) - 1)).toBeLessThan(1e-12);
    expect(Math.abs(body.asBuilt!.predictedHz / f0(10e-6, 1e-9 + 11.025 * pF) - 1)).toBeLessThan(1e-9);
    expect(body.figure!.buildIds).toHaveLength(5);
  });

  it("without_a_figure_answers_the_design_prediction_only_with_the_reason", async () => {
    const res = await api("get", `/api/v1/designs/${designId}/prediction?construction=${encodeURIComponent(`pcb:none ${tag()}`)}`, team.viewer);
    expect(res.status, res.text).toBe(200);
    expect(res.body.asBuilt).toBeNull();
    expect(res.body.error).toMatch(/only the prediction as designed is known/);
  });

  it("refuses_a_construction_it_does_not_know", async () => {
    const problem = expectProblem(await api("get", `/api/v1/designs/${designId}/prediction?construction=breadboard:rev%20B`, team.viewer), 400);
    expect(problem.fields?.construction?.[0]).toMatch(/pcb:<revision>/);
  });

  it("an_unknown_design_is_404_and_no_token_is_401", async () => {
    expectProblem(await api("get", "/api/v1/designs/00000000-0000-4000-8000-000000000000/prediction", team.viewer), 404);
    expectProblem(await api("get", `/api/v1/designs/${designId}/prediction`, null), 401);
  });
});

describe("GET /api/v1/builds/compare", () => {
  it.each(roles)("compares_builds_for_the_%s_role_in_the_order_asked", async (role) => {
    const ids = [builds[4].buildId, builds[0].buildId];
    const res = await api("get", `/api/v1/builds/compare?ids=${ids.join(",")}`, team[role]);
    expect(res.status, res.text).toBe(200);
    const body = expectDocumented(buildComparisonSchema, res.body);
    expect(body.items.map((i) => i.build.id)).toEqual(ids);
    const [clipped, first] = body.items;
    // The newest run of PCB-13 is the clipped one: the comparison shows it with its warning.
    expect(clipped.latestRun!.warningCodes).toEqual(["clipping"]);
    expect(clipped.latestRun!.thdPercent).toBe(4.2);
    expect(first.latestRun!.harmonics).toEqual([{ order: 2, dBc: -45 }, { order: 3, dBc: -52 }]);
    expect(first.trend.verdict).toBe("steady");
    expect(first.construction.name).toBe(`PCB ${revision}`);
    expect(first.runCount).toBe(3);
    // Hand: offset = measured − predicted for 9 pF extra on the 1 nF tank.
    expect(Math.abs(first.offsetHz! - (f0(10e-6, 1.009e-9) - f0(10e-6, 1e-9)))).toBeLessThan(1e-3);
  });

  it("needs_two_distinct_builds", async () => {
    expectProblem(await api("get", `/api/v1/builds/compare?ids=${builds[0].buildId}`, team.viewer), 400);
    expectProblem(await api("get", `/api/v1/builds/compare?ids=${builds[0].buildId},${builds[0].buildId}`, team.viewer), 400);
    expectProblem(await api("get", "/api/v1/builds/compare?ids=abc,def", team.viewer), 400);
  });

  it("an_unknown_build_is_404_and_no_token_is_401", async () => {
    expectProblem(await api("get", `/api/v1/builds/compare?ids=${builds[0].buildId},00000000-0000-4000-8000-000000000000`, team.viewer), 404);
    expectProblem(await api("get", `/api/v1/builds/compare?ids=${builds[0].buildId},${builds[1].buildId}`, null), 401);
  });
});
