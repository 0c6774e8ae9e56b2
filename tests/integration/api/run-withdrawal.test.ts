import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { listBuilds } from "@/db/queries/builds";
import { getBuildTableRow } from "@/db/queries/dashboard";
import { closeLucia } from "@/lib/auth/lucia";
import { buildComparisonSchema, layoutFigureListSchema } from "@/lib/openapi/schemas/layouts";
import { runWithdrawalSchema } from "@/lib/openapi/schemas/run";
import { logAnalysedRun, logSegments, logTweak, makeDesign, makeLayoutBuild, makePerson, pF, tag, type LayoutBuildFixture } from "../layouts/fixtures";
import { api, createRoleTeam, expectDocumented, expectProblem, sendJson, UNKNOWN_ID, type ApiPerson, type Role } from "./helpers";

// Withdrawing a run through POST/DELETE /api/v1/runs/{id}/withdrawal, in real PostgreSQL behind the running app:
// who may (the roles that edit a build: technician and above), what bad input gets, and that the lab's figure,
// the comparison's latest run and trend and the build's state leave a withdrawn run out while its lists keep it.

let team: Record<Role, ApiPerson>;
let revision: string;
let builds: LayoutBuildFixture[];
/** The odd newest run of builds[0]: 40 pF where its other runs say 10 pF, and a failed verdict. */
let oddRunId: string;
/** Runs the role matrix withdraws and restores, one per role. */
const matrixRuns: Partial<Record<Role, string>> = {};

beforeAll(async () => {
  team = await createRoleTeam("withdrawal");
  const engineer = await makePerson("engineer");
  const design = await makeDesign(engineer);
  revision = `rev ${tag()}`;
  builds = [];
  for (const v of [10, 11, 12]) {
    const fx = await makeLayoutBuild({ owner: engineer, design, revision, label: `W-${v}` });
    await logSegments(fx, engineer, [[v, v + 0.1], [v]]);
    builds.push(fx);
  }
  await db()("runs").whereIn("build_id", builds.map((b) => b.buildId)).update({ verdict: "pass" });
  // After a tweak, so it is a segment of its own: 40 pF against 10 pF is a change, not a steady figure.
  await logTweak(builds[0], engineer);
  oddRunId = await logAnalysedRun(builds[0], engineer, 40 * pF, { verdict: "fail", thdPercent: 7.5 });
  // A separate build for the role matrix, so its withdrawals never touch the figure under test.
  const other = await makeLayoutBuild({ owner: engineer, design, revision: `rev ${tag()}`, label: "matrix" });
  for (const role of ["viewer", "technician", "engineer", "admin"] as const) matrixRuns[role] = await logAnalysedRun(other, engineer, 5 * pF);
}, 120_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

const withdrawal = (runId: string) => `/api/v1/runs/${runId}/withdrawal`;

async function figure() {
  const res = await api("get", "/api/v1/layouts?kind=pcb&topology=tank", team.viewer);
  expect(res.status, res.text).toBe(200);
  return expectDocumented(layoutFigureListSchema, res.body).items.find((f) => f.construction.revision === revision) ?? null;
}

async function comparison() {
  const res = await api("get", `/api/v1/builds/compare?ids=${builds[0].buildId},${builds[1].buildId}`, team.viewer);
  expect(res.status, res.text).toBe(200);
  return expectDocumented(buildComparisonSchema, res.body).items[0];
}

describe("withdrawing a run leaves it out of every aggregate and keeps it in the lists", () => {
  it("counts_the_odd_run_before_it_is_withdrawn", async () => {
    // 40 pF after 10 pF is a change, not a steady figure: W-10 is not behind the lab's figure.
    expect((await figure())!.builds.map((b) => b.label)).toEqual(["W-11", "W-12"]);
    const first = await comparison();
    expect(first.latestRun!.id).toBe(oddRunId);
    expect(first.trend.verdict).not.toBe("steady");
    expect((await getBuildTableRow(builds[0].buildId))!.state).toBe("flagged");
  });

  it("withdraws_it_with_the_reason_and_an_audit_row", async () => {
    const res = await sendJson("post", withdrawal(oddRunId), team.technician, { reason: "  Probe on ×1, not ×10  " });
    expect(res.status, res.text).toBe(200);
    const body = expectDocumented(runWithdrawalSchema, res.body);
    expect(body.reason).toBe("Probe on ×1, not ×10");
    expect(body.withdrawnBy).toBe(team.technician.id);
    expect(body.buildId).toBe(builds[0].buildId);
    const audit = await db()("audit_events").where({ entity_type: "run", entity_id: oddRunId, action: "run.withdrawn" });
    expect(audit).toHaveLength(1);
    expect(audit[0].actor_id).toBe(team.technician.id);
    expect(audit[0].detail.reason).toBe("Probe on ×1, not ×10");
  });

  it("leaves_it_out_of_the_figure_the_comparison_and_the_build_state", async () => {
    // Hand: W-10's other runs give segment means 10.05 and 10 pF → steady, typical 10.025 pF; it joins the figure.
    const f = (await figure())!;
    expect(f.builds.map((b) => b.label)).toEqual(["W-10", "W-11", "W-12"]);
    expect(Math.abs(f.capacitanceF.median! - 11.025 * pF)).toBeLessThan(1e-6 * pF);
    const first = await comparison();
    expect(first.latestRun!.id).not.toBe(oddRunId);
    expect(Math.abs(first.latestRun!.impliedExtraCapacitanceF! - 10 * pF)).toBeLessThan(1e-6 * pF);
    expect(first.trend.verdict).toBe("steady");
    expect(first.runCount).toBe(3);
    expect((await getBuildTableRow(builds[0].buildId))!.state).toBe("in-spec");
    const listed = (await listBuilds(builds[0].designId, { limit: 50 })).items.find((b) => b.id === builds[0].buildId)!;
    expect(listed.latestRun!.id).not.toBe(oddRunId);
  });

  it("keeps_it_in_the_build_s_run_list_marked_withdrawn", async () => {
    const res = await api("get", `/api/v1/builds/${builds[0].buildId}/runs?limit=50`, team.viewer);
    expect(res.status, res.text).toBe(200);
    const items = res.body.items as { id: string; withdrawal: { reason: string } | null }[];
    expect(items).toHaveLength(4);
    expect(items.find((r) => r.id === oddRunId)!.withdrawal!.reason).toBe("Probe on ×1, not ×10");
    expect(items.filter((r) => r.withdrawal === null)).toHaveLength(3);
    const run = await api("get", `/api/v1/runs/${oddRunId}`, team.viewer);
    expect(run.body.withdrawal.withdrawnBy).toBe(team.technician.id);
    expect(run.body.results).not.toBeNull();
  });

  it("refuses_a_second_withdrawal_and_restores_it_into_the_figures", async () => {
    expectProblem(await sendJson("post", withdrawal(oddRunId), team.engineer, { reason: "again" }), 409);
    const res = await api("delete", withdrawal(oddRunId), team.engineer);
    expect(res.status, res.text).toBe(204);
    expect((await figure())!.builds.map((b) => b.label)).toEqual(["W-11", "W-12"]);
    expect((await comparison()).latestRun!.id).toBe(oddRunId);
    expect((await getBuildTableRow(builds[0].buildId))!.state).toBe("flagged");
    const restored = await db()("audit_events").where({ entity_type: "run", entity_id: oddRunId, action: "run.restored" });
    expect(restored).toHaveLength(1);
    expect(restored[0].detail.reason).toBe("Probe on ×1, not ×10");
    expectProblem(await api("delete", withdrawal(oddRunId), team.engineer), 409);
  });
});

describe("POST and DELETE /api/v1/runs/{runId}/withdrawal: the role matrix", () => {
  it.each(["technician", "engineer", "admin"] as const)("lets_the_%s_role_withdraw_and_restore", async (role) => {
    const runId = matrixRuns[role]!;
    const res = await sendJson("post", withdrawal(runId), team[role], { reason: `wrong board, ${role}` });
    expect(res.status, res.text).toBe(200);
    expect(res.body.withdrawnByName).toBe(team[role].name);
    expect((await api("delete", withdrawal(runId), team[role])).status).toBe(204);
  });

  it("refuses_the_viewer_role_both_ways_naming_the_role_needed", async () => {
    const runId = matrixRuns.viewer!;
    const refused = expectProblem(await sendJson("post", withdrawal(runId), team.viewer, { reason: "not mine to do" }), 403);
    expect(refused.detail).toMatch(/Withdrawing or restoring runs needs the technician role or above/);
    await sendJson("post", withdrawal(runId), team.technician, { reason: "so the viewer can try restoring" }).expect(200);
    expectProblem(await api("delete", withdrawal(runId), team.viewer), 403);
    const run = await api("get", `/api/v1/runs/${runId}`, team.viewer);
    expect(run.body.withdrawal).not.toBeNull();
    await api("delete", withdrawal(runId), team.technician).expect(204);
  });

  it("refuses_without_credentials", async () => {
    expectProblem(await sendJson("post", withdrawal(matrixRuns.viewer!), null, { reason: "anonymous" }), 401);
    expectProblem(await api("delete", withdrawal(matrixRuns.viewer!), null), 401);
  });
});

describe("bad input", () => {
  it("a_missing_or_blank_reason_is_400_naming_the_field", async () => {
    const missing = expectProblem(await sendJson("post", withdrawal(matrixRuns.viewer!), team.technician, {}), 400);
    expect(missing.fields?.reason?.[0]).toMatch(/Say why the run is withdrawn/);
    const blank = expectProblem(await sendJson("post", withdrawal(matrixRuns.viewer!), team.technician, { reason: "   " }), 400);
    expect(blank.fields?.reason?.[0]).toMatch(/Say why/);
    const long = expectProblem(await sendJson("post", withdrawal(matrixRuns.viewer!), team.technician, { reason: "x".repeat(2001) }), 400);
    expect(long.fields?.reason?.[0]).toMatch(/at most 2000 characters/);
    const run = await api("get", `/api/v1/runs/${matrixRuns.viewer!}`, team.viewer);
    expect(run.body.withdrawal).toBeNull();
  });

  it("a_body_that_is_not_json_is_400", async () => {
    const res = await api("post", withdrawal(matrixRuns.viewer!), team.technician).set("content-type", "text/plain").send("reason=oops");
    expectProblem(res, 400);
  });

  it("an_unknown_or_malformed_run_is_404", async () => {
    expectProblem(await sendJson("post", withdrawal(UNKNOWN_ID), team.technician, { reason: "no such run" }), 404);
    expectProblem(await sendJson("post", withdrawal("not-a-run"), team.technician, { reason: "no such run" }), 404);
    expectProblem(await api("delete", withdrawal(UNKNOWN_ID), team.technician), 404);
  });
});

describe("GET /api/v1/builds/compare with chosen runs", () => {
  it("compares_a_chosen_withdrawn_run_marked_while_the_trend_still_leaves_it_out", async () => {
    await sendJson("post", withdrawal(oddRunId), team.technician, { reason: "compare test" }).expect(200);
    try {
      const res = await api("get", `/api/v1/builds/compare?ids=${builds[0].buildId},${builds[1].buildId}&runs=${oddRunId}`, team.viewer);
      expect(res.status, res.text).toBe(200);
      const [first, second] = expectDocumented(buildComparisonSchema, res.body).items;
      expect(first.latestRun!.id).toBe(oddRunId);
      expect(first.latestRun!.chosen).toBe(true);
      expect(first.latestRun!.withdrawnAt).not.toBeNull();
      expect(first.latestRun!.thdPercent).toBe(7.5);
      expect(first.trend.verdict).toBe("steady");
      expect(first.runChoices).toHaveLength(4);
      expect(first.runChoices[0]).toMatchObject({ id: oddRunId, withdrawn: true });
      expect(second.latestRun!.chosen).toBe(false);
      // Runs analysed before the engine measured stability say so, with the reason, never 0.
      expect(second.latestRun!.stability).toMatchObject({ measured: false, rmsJitterS: null, phaseNoise: [], allan: [] });
      expect(second.latestRun!.stability.reason).toMatch(/not measured/);
    } finally {
      await api("delete", withdrawal(oddRunId), team.technician).expect(204);
    }
  });

  it("reads_the_stability_figures_the_analysis_stored", async () => {
    const runId = (await comparison()).latestRun!.id;
    const stability = {
      jitter: { rmsJitterS: 2.5e-12, reason: null },
      phaseNoise: { points: [{ offsetHz: 10_000, dbcPerHz: -131, atFloor: true }, { offsetHz: 1000, dbcPerHz: -112.5, atFloor: false }] },
      allan: { points: [{ tauS: 1e-4, adev: 3e-8 }] },
    };
    await db()("runs").where({ id: runId }).update({ results: db().raw("results || ?::jsonb", [JSON.stringify({ stability })]) });
    const s = (await comparison()).latestRun!.stability;
    expect(s.measured).toBe(true);
    expect(s.rmsJitterS).toBe(2.5e-12);
    expect(s.phaseNoise).toEqual([{ offsetHz: 1000, dbcPerHz: -112.5, atFloor: false }, { offsetHz: 10_000, dbcPerHz: -131, atFloor: true }]);
    expect(s.allan).toEqual([{ tauS: 1e-4, adev: 3e-8 }]);
  });

  it("refuses_a_run_of_another_build_or_two_runs_of_one_build_naming_runs", async () => {
    const base = `/api/v1/builds/compare?ids=${builds[0].buildId},${builds[1].buildId}`;
    const foreign = expectProblem(await api("get", `${base}&runs=${matrixRuns.viewer}`, team.viewer), 400);
    expect(foreign.fields?.runs?.[0]).toMatch(/not an analysed run of the compared builds/);
    const first = await comparison();
    const twice = expectProblem(await api("get", `${base}&runs=${first.runChoices[0].id},${first.runChoices[1].id}`, team.viewer), 400);
    expect(twice.fields?.runs?.[0]).toMatch(/at most one run per build/);
    expectProblem(await api("get", `${base}&runs=not-a-run`, team.viewer), 400);
  });
});
