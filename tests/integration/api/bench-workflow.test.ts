import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { importCapture } from "@/lib/analysis/csv-import";
import { closeLucia } from "@/lib/auth/lucia";
import { tweakSchema } from "@/lib/openapi/schemas/tweak";
import { EXCERPT_MAX_SAMPLES } from "@/lib/validations/run-excerpt";
import { api, captureCsv, createFixture, expectDocumented, expectProblem, sendJson, uploadCapture, UNKNOWN_ID, waitForRun, type Fixture } from "./helpers";

let fx: Fixture;

beforeAll(async () => {
  fx = await createFixture("bench");
}, 60_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("POST /api/v1/builds/{buildId}/tweaks/{tweakId}/apply", () => {
  it("applies_a_planned_tweak_once_updating_the_as_built_value_and_refuses_viewers_a_second_apply_and_another_build", async () => {
    const planned = await sendJson("post", `/api/v1/builds/${fx.buildId}/tweaks`, fx.team.technician, { partRef: "C1", toValue: "2n7", planned: true, note: "try next" });
    expect(planned.status, planned.text).toBe(201);
    const path = `/api/v1/builds/${fx.buildId}/tweaks/${planned.body.id}/apply`;

    expectProblem(await api("post", path, fx.team.viewer), 403);
    const before = await api("get", `/api/v1/builds/${fx.buildId}`, fx.team.viewer);
    expect(before.body.asBuilt.C1.valueSi).toBeCloseTo(2.2e-9, 20);

    const applied = await api("post", path, fx.team.technician);
    expect(applied.status, applied.text).toBe(200);
    const tweak = expectDocumented(tweakSchema, applied.body);
    expect(tweak).toMatchObject({ id: planned.body.id, partRef: "C1", planned: false, note: "try next" });
    expect(tweak.fromValue).toBeCloseTo(2.2e-9, 20);
    const after = await api("get", `/api/v1/builds/${fx.buildId}`, fx.team.viewer);
    expect(after.body.asBuilt.C1.valueSi).toBeCloseTo(2.7e-9, 20);
    expect(await db()("audit_events").where({ action: "tweak.applied", entity_id: tweak.id })).toHaveLength(1);

    expectProblem(await api("post", path, fx.team.technician), 409);
    const other = await createFixture("bench other", fx.team);
    expectProblem(await api("post", `/api/v1/builds/${other.buildId}/tweaks/${planned.body.id}/apply`, fx.team.technician), 404);
    expectProblem(await api("post", `/api/v1/builds/${fx.buildId}/tweaks/${UNKNOWN_ID}/apply`, fx.team.technician), 404);
    expectProblem(await api("post", path, null), 401);
  });
});

describe("GET /api/v1/runs/{runId}/excerpt", () => {
  const sampleRateHz = 50e6; // captureCsv's rate
  let runId: string;
  let csv: string;

  beforeAll(async () => {
    csv = captureCsv(411e3, 77);
    const res = await uploadCapture(fx.buildId, fx.team.technician, csv, { probe: "10" });
    expect(res.status, res.text).toBe(201);
    runId = res.body.id;
    expect((await waitForRun(runId, fx.team.viewer)).status).toBe("done");
  }, 120_000);

  it("answers_the_stored_samples_of_the_window_with_the_probe_applied_for_any_role", async () => {
    const capture = importCapture(csv);
    const fromS = capture.startTimeS + 1000 / sampleRateHz;
    const toS = capture.startTimeS + 1249 / sampleRateHz;
    const res = await api("get", `/api/v1/runs/${runId}/excerpt?fromS=${fromS}&toS=${toS}`, fx.team.viewer);
    expect(res.status, res.text).toBe(200);
    expect(res.body.channel).toBe(capture.channels[0].name);
    expect(res.body.sampleRateHz).toBeCloseTo(sampleRateHz, 0);
    expect(res.body.timeS).toHaveLength(250);
    expect(res.body.volts).toHaveLength(250);
    for (const k of [0, 1, 124, 249]) {
      expect(res.body.timeS[k]).toBeCloseTo(capture.startTimeS + (1000 + k) / sampleRateHz, 15);
      expect(res.body.volts[k]).toBeCloseTo(capture.channels[0].samples[1000 + k] * 10, 9);
    }
  });

  it("refuses_a_window_too_wide_one_outside_the_record_and_a_malformed_query_with_400", async () => {
    const wide = expectProblem(await api("get", `/api/v1/runs/${runId}/excerpt?fromS=0&toS=${(EXCERPT_MAX_SAMPLES + 10) / sampleRateHz}`, fx.team.viewer), 400);
    expect(wide.detail).toMatch(/holds 5011 samples; an excerpt holds at most 5000/);
    expect(expectProblem(await api("get", `/api/v1/runs/${runId}/excerpt?fromS=10&toS=11`, fx.team.viewer), 400).detail).toMatch(/outside the record/);
    expect(expectProblem(await api("get", `/api/v1/runs/${runId}/excerpt?fromS=2e-6&toS=1e-6`, fx.team.viewer), 400).fields).toHaveProperty("toS");
    expect(expectProblem(await api("get", `/api/v1/runs/${runId}/excerpt?fromS=soon&toS=1e-6`, fx.team.viewer), 400).fields).toHaveProperty("fromS");
    expectProblem(await api("get", `/api/v1/runs/${UNKNOWN_ID}/excerpt?fromS=0&toS=1e-6`, fx.team.viewer), 404);
  });
});

describe("uploading a file the importer cannot read", () => {
  const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 0, 0, 1, 0]);
  it.each([
    ["notes.txt", Buffer.from("Bench notes\nC2 swapped for 27n; the output looked clean.\n"), /No rows of numbers found/],
    ["header-only.csv", Buffer.from("Time (s),Out (V)\n"), /Header only: no data rows after the header on line 1/],
    ["scope.csv", png, /binary/],
    ["zeit.csv", Buffer.from("Zeit (s);Kanal 1 (V)\n" + Array.from({ length: 100 }, (_, i) => `${i};0,${i % 10}`).join("\n") + "\n"), /No time column/],
  ])("refuses %s with a 400 naming the problem, before any run exists", async (filename, body, message) => {
    const runsBefore = Number((await db()("runs").where({ build_id: fx.buildId }).count<{ count: string }[]>("* as count"))[0].count);
    const res = await uploadCapture(fx.buildId, fx.team.technician, body, {}, { filename });
    const problem = expectProblem(res, 400);
    expect(problem.detail).toMatch(/^This file cannot be analysed, so no run was logged: /);
    expect(problem.detail).toMatch(message);
    const runsAfter = Number((await db()("runs").where({ build_id: fx.buildId }).count<{ count: string }[]>("* as count"))[0].count);
    expect(runsAfter).toBe(runsBefore);
  });
});
