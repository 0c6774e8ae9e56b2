import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { flagSchema } from "@/lib/openapi/schemas/common";
import { buildFollowSchema, projectFollowSchema, retuneSchema, reviewOutcomeSchema } from "@/lib/openapi/schemas/review";
import { tweakSchema } from "@/lib/openapi/schemas/tweak";
import { api, captureCsv, createFixture, expectDocumented, expectProblem, sendJson, uploadCapture, UNKNOWN_ID, waitForRun, type Fixture } from "./helpers";

let fx: Fixture;
/** A run 4 % below the 411 kHz target: its frequency rule fails, so it carries a flag. */
let flagged: { id: string; flagId: string };

beforeAll(async () => {
  fx = await createFixture("reviews");
  const res = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(395e3, 81));
  expect(res.status, res.text).toBe(201);
  const run = await waitForRun(res.body.id, fx.team.viewer);
  expect(run.verdict).toBe("fail");
  flagged = { id: res.body.id, flagId: (run.flags as { id: string }[])[0].id };
}, 120_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("POST /api/v1/builds/{buildId}/review", () => {
  it("needs_a_reason_to_accept_a_flagged_build_and_records_it", async () => {
    const noReason = expectProblem(await sendJson("post", `/api/v1/builds/${fx.buildId}/review`, fx.team.engineer, { decision: "accept" }), 400);
    expect(noReason.fields).toHaveProperty("reason");
    const res = await sendJson("post", `/api/v1/builds/${fx.buildId}/review`, fx.team.engineer, { decision: "accept", reason: "Within the loose bench limit" });
    expect(res.status, res.text).toBe(200);
    const out = expectDocumented(reviewOutcomeSchema, res.body);
    expect(out.build.status).toBe("accepted");
    expect(out.signOff).toEqual({ reason: "Within the loose bench limit", runId: flagged.id });
    expect(out.flaggedRules).toContain("frequency");
    const reopened = await sendJson("post", `/api/v1/builds/${fx.buildId}/review`, fx.team.admin, { decision: "reopen" });
    expect(reopened.body.build.status).toBe("open");
  });

  it("answers_400_for_a_rejection_without_comment_403_below_engineer_and_404_for_an_unknown_build", async () => {
    expect(expectProblem(await sendJson("post", `/api/v1/builds/${fx.buildId}/review`, fx.team.engineer, { decision: "reject" }), 400).fields).toHaveProperty("comment");
    expectProblem(await sendJson("post", `/api/v1/builds/${fx.buildId}/review`, fx.team.engineer, { decision: "maybe" }), 400);
    expectProblem(await sendJson("post", `/api/v1/builds/${fx.buildId}/review`, fx.team.technician, { decision: "reopen" }), 403);
    expectProblem(await sendJson("post", `/api/v1/builds/${UNKNOWN_ID}/review`, fx.team.engineer, { decision: "reopen" }), 404);
  });
});

describe("POST /api/v1/flags/{flagId}/acknowledge", () => {
  it("acknowledges_once_for_engineers_then_answers_409", async () => {
    expectProblem(await api("post", `/api/v1/flags/${flagged.flagId}/acknowledge`, fx.team.technician), 403);
    const res = await api("post", `/api/v1/flags/${flagged.flagId}/acknowledge`, fx.team.engineer);
    expect(res.status, res.text).toBe(200);
    const flag = expectDocumented(flagSchema, res.body);
    expect(flag.acknowledgedByName).toBe(fx.team.engineer.name);
    expect(flag.acknowledgedAt).toMatch(/Z$/);
    expectProblem(await api("post", `/api/v1/flags/${flagged.flagId}/acknowledge`, fx.team.admin), 409);
    expectProblem(await api("post", `/api/v1/flags/${UNKNOWN_ID}/acknowledge`, fx.team.engineer), 404);
  });
});

describe("/api/v1/builds/{buildId}/follow and /api/v1/projects/{projectId}/follow", () => {
  it("follows_and_unfollows_a_build_and_a_project_for_any_role", async () => {
    const viewer = fx.team.viewer;
    const start = expectDocumented(buildFollowSchema, (await api("get", `/api/v1/builds/${fx.buildId}/follow`, viewer)).body);
    expect(start.following).toBe(false);
    const on = await api("put", `/api/v1/builds/${fx.buildId}/follow`, viewer);
    expect(on.status, on.text).toBe(200);
    expect(expectDocumented(buildFollowSchema, on.body)).toMatchObject({ following: true, via: "build" });
    const off = await api("delete", `/api/v1/builds/${fx.buildId}/follow`, viewer);
    expect(off.body.following).toBe(false);

    const project = await api("put", `/api/v1/projects/${fx.projectId}/follow`, viewer);
    expect(expectDocumented(projectFollowSchema, project.body)).toEqual({ following: true });
    expect((await api("get", `/api/v1/projects/${fx.projectId}/follow`, viewer)).body).toEqual({ following: true });
    expect((await api("delete", `/api/v1/projects/${fx.projectId}/follow`, viewer)).body).toEqual({ following: false });

    expectProblem(await api("put", `/api/v1/builds/${UNKNOWN_ID}/follow`, viewer), 404);
    expectProblem(await api("get", `/api/v1/projects/${UNKNOWN_ID}/follow`, viewer).query({}), 404);
    expectProblem(await api("put", `/api/v1/builds/${fx.buildId}/follow`, null), 401);
  });
});

describe("/api/v1/builds/{buildId}/retune", () => {
  it("suggests_a_standard_value_and_plans_it_as_a_tweak_once", async () => {
    const res = await api("get", `/api/v1/builds/${fx.buildId}/retune`, fx.team.viewer).query({ series: "E24" });
    expect(res.status, res.text).toBe(200);
    const retune = expectDocumented(retuneSchema, res.body);
    expect(retune.runId).toBe(flagged.id);
    expect(retune.suggestion!.series).toBe("E24");
    expect(retune.suggestion!.targetHz).toBe(411e3);
    expectProblem(await api("get", `/api/v1/builds/${fx.buildId}/retune`, fx.team.viewer).query({ series: "E7" }), 400);

    expectProblem(await sendJson("post", `/api/v1/builds/${fx.buildId}/retune`, fx.team.viewer, { series: "E24" }), 403);
    const planned = await sendJson("post", `/api/v1/builds/${fx.buildId}/retune`, fx.team.technician, { series: "E24" });
    expect(planned.status, planned.text).toBe(201);
    expect(expectDocumented(tweakSchema, planned.body)).toMatchObject({ planned: true, partRef: retune.suggestion!.part });
    const twice = await sendJson("post", `/api/v1/builds/${fx.buildId}/retune`, fx.team.technician, { series: "E24" });
    expect(twice.status).toBe(200);
    expect(twice.body.id).toBe(planned.body.id);
  });
});

describe("GET /api/v1/builds/{buildId}/runs.csv", () => {
  it("exports_the_filtered_runs_as_csv", async () => {
    const res = await api("get", `/api/v1/builds/${fx.buildId}/runs.csv`, fx.team.viewer).query({ verdict: "fail" }).buffer(true).parse((r, cb) => {
      let text = "";
      r.on("data", (c: Buffer) => (text += c.toString("utf8")));
      r.on("end", () => cb(null, text));
    });
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^text\/csv/);
    expect(res.headers["content-disposition"]).toMatch(/attachment; filename=".+\.csv"/);
    const lines = String(res.body).trim().split(/\r?\n/);
    expect(lines.length).toBe(2);
    expect(lines[1]).toContain(flagged.id);
    expectProblem(await api("get", `/api/v1/builds/${UNKNOWN_ID}/runs.csv`, fx.team.viewer), 404);
    expectProblem(await api("get", `/api/v1/builds/${fx.buildId}/runs.csv`, fx.team.viewer).query({ verdict: "maybe" }), 400);
  });
});
