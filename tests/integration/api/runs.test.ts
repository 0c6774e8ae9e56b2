import { execFile } from "node:child_process";
import { randomUUID } from "node:crypto";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import http from "node:http";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { uploadLimitBytes } from "@/lib/logbook/capture-files";
import { runAcceptedSchema, runPageSchema, runPlotSchema, runSchema, runSummarySchema } from "@/lib/openapi/schemas/run";
import { allKeys, api, appUrl, captureCsv, createFixture, expectDocumented, expectProblem, uploadCapture, UNKNOWN_ID, waitForRun, type Fixture } from "./helpers";

const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, "../../..");

let fx: Fixture;
let tmp: string;
/** The build's prediction (Hz) from GET /builds/{id}: what the snapshot of a run logged now must hold. */
let predictedHz: number;
/** A capture 2000 ppm below the prediction, uploaded once and analysed, shared by the read tests. */
let analysed: { id: string; csv: string; body: Record<string, unknown> };

beforeAll(async () => {
  tmp = mkdtempSync(path.join(tmpdir(), "tankbook-api-runs-"));
  fx = await createFixture("runs");
  predictedHz = (await api("get", `/api/v1/builds/${fx.buildId}`, fx.team.viewer)).body.prediction.predictedHz;
  const csv = captureCsv(predictedHz * (1 - 2000e-6), 11);
  const res = await uploadCapture(fx.buildId, fx.team.technician, csv, { note: "shared capture" });
  expect(res.status, res.text).toBe(201);
  analysed = { id: res.body.id, csv, body: await waitForRun(res.body.id, fx.team.viewer) };
}, 120_000);

afterAll(async () => {
  rmSync(tmp, { recursive: true, force: true });
  await closeDb();
  await closeLucia();
});

describe("POST /api/v1/builds/{buildId}/runs", () => {
  it("answers_201_with_id_status_and_location_and_queues_the_analysis", async () => {
    const res = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(predictedHz, 21), { channel: "Out", probe: "1", supplyV: "12", temperatureC: "23.5", note: "fresh" });
    expect(res.status, res.text).toBe(201);
    const accepted = expectDocumented(runAcceptedSchema, res.body);
    expect(["queued", "running", "done"]).toContain(accepted.status);
    expect(res.headers.location).toBe(`/api/v1/runs/${accepted.id}`);
    const done = await waitForRun(accepted.id, fx.team.viewer);
    expect(done).toMatchObject({ status: "done", channel: "Out", supplyV: 12, temperatureC: 23.5, note: "fresh", probeAttenuation: 1 });
  });

  it("returns_the_first_run_for_a_retry_with_the_same_idempotency_key", async () => {
    const key = randomUUID();
    const csv = captureCsv(predictedHz, 31);
    const first = await uploadCapture(fx.buildId, fx.team.technician, csv, {}, { idempotencyKey: key });
    expect(first.status, first.text).toBe(201);
    const retry = await uploadCapture(fx.buildId, fx.team.technician, csv, {}, { idempotencyKey: key });
    expect(retry.status, retry.text).toBe(200);
    expect(retry.body.id).toBe(first.body.id);
    expect(retry.headers["idempotent-replayed"]).toBe("true");
    expect(retry.headers.location).toBe(`/api/v1/runs/${first.body.id}`);
    // A different file under the same key is another request, refused with 422 (draft-ietf-httpapi-idempotency-key-header §2.7).
    const sameKeyOtherFile = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(predictedHz, 32), {}, { idempotencyKey: key });
    expectProblem(sameKeyOtherFile, 422);
    const list = await api("get", `/api/v1/builds/${fx.buildId}/runs`, fx.team.viewer).query({ limit: 200 });
    expect(list.body.items.filter((r: { id: string }) => r.id === first.body.id)).toHaveLength(1);
  });

  it("answers_409_with_the_existing_run_for_a_capture_already_logged_unless_keepDuplicate", async () => {
    const dup = await uploadCapture(fx.buildId, fx.team.technician, analysed.csv);
    const problem = expectProblem(dup, 409);
    expect(problem.existingRunId).toBe(analysed.id);
    expect(problem.type).toMatch(/duplicate-capture$/);
    const kept = await uploadCapture(fx.buildId, fx.team.technician, analysed.csv, { keepDuplicate: "true" });
    expect(kept.status, kept.text).toBe(201);
    const copy = await api("get", `/api/v1/runs/${kept.body.id}`, fx.team.viewer);
    expect(copy.body.duplicateOfRunId).toBe(analysed.id);
  });

  it("answers_413_when_the_announced_length_is_over_UPLOAD_LIMIT_BYTES_before_reading_the_body", async () => {
    // Only the headers and a few bytes are sent: the handler must refuse on Content-Length alone.
    const url = new URL(`/api/v1/builds/${fx.buildId}/runs`, appUrl());
    const announced = uploadLimitBytes() + 10 * 1024 * 1024;
    const answer = await new Promise<{ status: number; type: string; body: string }>((resolve, reject) => {
      const req = http.request(url, {
        method: "POST",
        headers: {
          authorization: `Bearer ${fx.team.technician.token}`,
          "content-type": "multipart/form-data; boundary=xyz",
          "content-length": String(announced),
        },
      });
      req.on("response", (res) => {
        let body = "";
        res.on("data", (c) => (body += c));
        res.on("end", () => {
          resolve({ status: res.statusCode ?? 0, type: String(res.headers["content-type"]), body });
          req.destroy();
        });
      });
      req.on("error", reject);
      req.write("--xyz\r\n");
    });
    expect(answer.status).toBe(413);
    expect(answer.type).toMatch(/^application\/problem\+json/);
    expect(JSON.parse(answer.body)).toMatchObject({ status: 413, title: "Payload too large" });
  });

  it("answers_415_for_a_file_that_is_not_a_csv_and_for_a_body_that_is_not_multipart", async () => {
    expectProblem(await uploadCapture(fx.buildId, fx.team.technician, Buffer.from([0x89, 0x50, 0x4e, 0x47]), {}, { filename: "scope.png", contentType: "image/png" }), 415);
    expectProblem(await api("post", `/api/v1/builds/${fx.buildId}/runs`, fx.team.technician).set("content-type", "application/json").send("{}"), 415);
  });

  it("answers_400_for_bad_fields_a_missing_file_a_bad_idempotency_key_and_another_build's_tweak", async () => {
    const probe = expectProblem(await uploadCapture(fx.buildId, fx.team.technician, captureCsv(predictedHz, 41), { probe: "0.5" }), 400);
    expect(probe.fields).toHaveProperty("probe");
    const noFile = await api("post", `/api/v1/builds/${fx.buildId}/runs`, fx.team.technician).field("channel", "Out");
    expectProblem(noFile, 400);
    const badKey = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(predictedHz, 42), {}, { idempotencyKey: "x".repeat(201) });
    expectProblem(badKey, 400);
    const other = await createFixture("other-build", fx.team);
    const tweak = await api("post", `/api/v1/builds/${other.buildId}/tweaks`, fx.team.technician).set("content-type", "application/json").send({ note: "elsewhere" });
    const wrongTweak = expectProblem(await uploadCapture(fx.buildId, fx.team.technician, captureCsv(predictedHz, 43), { tweakId: tweak.body.id }), 400);
    expect(wrongTweak.fields).toHaveProperty("tweakId");
  });

  it("answers_401_without_a_token_403_for_a_viewer_and_404_for_an_unknown_build", async () => {
    const csv = captureCsv(predictedHz, 51);
    expectProblem(await uploadCapture(fx.buildId, null, csv), 401);
    expectProblem(await uploadCapture(fx.buildId, fx.team.viewer, csv), 403);
    expectProblem(await uploadCapture(UNKNOWN_ID, fx.team.technician, csv), 404);
  });
});

describe("GET /api/v1/runs/{runId}", () => {
  it("answers_the_documented_run_with_prediction_drift_implied_capacitance_verdict_and_flags", () => {
    const body = expectDocumented(runSchema, analysed.body);
    expect(body).toMatchObject({ id: analysed.id, buildId: fx.buildId, status: "done", verdict: "pass", error: null, flags: [] });
    expect(body.predictedHz).toBe(predictedHz);
    expect(body.snapshot.predictedHz).toBe(predictedHz);
    const measured = body.results!.frequencyHz as number;
    expect(body.measuredHz).toBe(measured);
    // Drift in ppm from its definition, (measured − predicted)/predicted; the capture was made 2000 ppm low.
    expect(body.driftPpm!).toBeCloseTo((measured / predictedHz - 1) * 1e6, 6);
    expect(Math.abs(body.driftPpm! + 2000)).toBeLessThan(2);
    // f ∝ 1/√C: the parallel capacitance that lowers f by 2000 ppm is C·((fp/fm)² − 1), C = C1C2/(C1+C2) (common practice).
    const cEffF = (2.2e-9 * 4.7e-9) / (2.2e-9 + 4.7e-9);
    const expectedExtraF = cEffF * ((predictedHz / measured) ** 2 - 1);
    expect(Math.abs(body.impliedExtraCapacitanceF! / expectedExtraF - 1)).toBeLessThan(0.01);
    expect(body.checks.length).toBeGreaterThan(0);
    expect(body.checks.every((c) => c.passed)).toBe(true);
  });

  it("uses_camelCase_names_and_ISO_8601_UTC_times_throughout", () => {
    // Parts, preamble metadata and method texts are keyed by the user's or the file's own names.
    const free = new Set(["parts", "asBuilt", "metadata", "method"]);
    const strip = (v: unknown): unknown =>
      Array.isArray(v) ? v.map(strip) : v && typeof v === "object" ? Object.fromEntries(Object.entries(v).filter(([k]) => !free.has(k)).map(([k, x]) => [k, strip(x)])) : v;
    const keys = allKeys(strip(analysed.body));
    expect(keys.filter((k) => !/^[a-z][a-zA-Z0-9]*$/.test(k))).toEqual([]);
    const times = Object.entries(analysed.body).filter(([k]) => k.endsWith("At"));
    expect(times.length).toBeGreaterThanOrEqual(4);
    for (const [k, v] of times) if (v !== null) expect(v, k).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
  });

  it("holds_in_results_exactly_what_npm_run_analyze_json_prints_for_the_same_file", async () => {
    const file = path.join(tmp, "shared.csv");
    writeFileSync(file, analysed.csv);
    const { stdout } = await run("npm", ["run", "-s", "analyze", "--", file, "--json"], { cwd: root, maxBuffer: 16 * 1024 * 1024 });
    const printed = JSON.parse(stdout);
    expect(Object.keys(analysed.body.results as object).sort()).toEqual(Object.keys(printed).sort());
    expect(analysed.body.results).toEqual(printed);
  });

  it("answers_results_null_and_the_error_for_a_capture_the_engine_cannot_read", async () => {
    const res = await uploadCapture(fx.buildId, fx.team.technician, "Time (s),Out (V)\n0,0.1\n1e-8,0.2\n");
    expect(res.status, res.text).toBe(201);
    const failed = await waitForRun(res.body.id, fx.team.viewer);
    expect(failed).toMatchObject({ status: "failed", results: null, verdict: null });
    expect(String(failed.error)).toMatch(/samples/);
  });

  it("answers_401_without_a_token_and_404_for_unknown_and_malformed_ids", async () => {
    expectProblem(await api("get", `/api/v1/runs/${analysed.id}`, null), 401);
    expectProblem(await api("get", `/api/v1/runs/${UNKNOWN_ID}`, fx.team.viewer), 404);
    expectProblem(await api("get", "/api/v1/runs/42", fx.team.viewer), 404);
  });
});

describe("GET /api/v1/builds/{buildId}/runs", () => {
  it("filters_by_verdict_status_and_time_and_pages_to_a_null_cursor", async () => {
    const all = await api("get", `/api/v1/builds/${fx.buildId}/runs`, fx.team.viewer).query({ limit: 200 });
    expect(all.status).toBe(200);
    const page = expectDocumented(runPageSchema, all.body);
    for (const item of page.items) expectDocumented(runSummarySchema, item);
    expect(page.nextCursor).toBeNull();
    const total = page.items.length;
    expect(total).toBeGreaterThanOrEqual(3);

    const ids: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const res = await api("get", `/api/v1/builds/${fx.buildId}/runs`, fx.team.viewer).query({ limit: 1, ...(cursor ? { cursor } : {}) });
      expect(res.body.items.length).toBeLessThanOrEqual(1);
      ids.push(...res.body.items.map((r: { id: string }) => r.id));
      cursor = res.body.nextCursor;
      pages++;
    } while (cursor && pages <= total + 1);
    expect(ids).toEqual(page.items.map((r) => r.id));

    const passed = await api("get", `/api/v1/builds/${fx.buildId}/runs`, fx.team.viewer).query({ verdict: "pass", status: "done" });
    expect(passed.body.items.map((r: { id: string }) => r.id)).toContain(analysed.id);
    expect(passed.body.items.every((r: { verdict: string; status: string }) => r.verdict === "pass" && r.status === "done")).toBe(true);
    const failedRuns = await api("get", `/api/v1/builds/${fx.buildId}/runs`, fx.team.viewer).query({ status: "failed" });
    expect(failedRuns.body.items.every((r: { status: string }) => r.status === "failed")).toBe(true);
    const future = await api("get", `/api/v1/builds/${fx.buildId}/runs`, fx.team.viewer).query({ from: "2999-01-01T00:00:00Z" });
    expect(future.body).toEqual({ items: [], nextCursor: null });
    const past = await api("get", `/api/v1/builds/${fx.buildId}/runs`, fx.team.viewer).query({ to: "2000-01-01T00:00:00Z" });
    expect(past.body.items).toEqual([]);
  });

  it("answers_400_for_limit_over_200_an_unknown_verdict_and_a_bad_time_and_404_for_an_unknown_build", async () => {
    expect(expectProblem(await api("get", `/api/v1/builds/${fx.buildId}/runs`, fx.team.viewer).query({ limit: 201 }), 400).fields).toHaveProperty("limit");
    expect(expectProblem(await api("get", `/api/v1/builds/${fx.buildId}/runs`, fx.team.viewer).query({ verdict: "maybe" }), 400).fields).toHaveProperty("verdict");
    expect(expectProblem(await api("get", `/api/v1/builds/${fx.buildId}/runs`, fx.team.viewer).query({ from: "yesterday" }), 400).fields).toHaveProperty("from");
    expectProblem(await api("get", `/api/v1/builds/${UNKNOWN_ID}/runs`, fx.team.viewer), 404);
  });
});

describe("POST /api/v1/runs/{runId}/reanalyse", () => {
  it("queues_a_finished_run_again_with_202_then_answers_409_while_it_is_queued", async () => {
    const res = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(predictedHz, 61));
    await waitForRun(res.body.id, fx.team.viewer);
    expectProblem(await api("post", `/api/v1/runs/${res.body.id}/reanalyse`, fx.team.viewer), 403);
    const again = await api("post", `/api/v1/runs/${res.body.id}/reanalyse`, fx.team.technician);
    expect(again.status, again.text).toBe(202);
    expect(expectDocumented(runAcceptedSchema, again.body)).toEqual({ id: res.body.id, status: "queued" });
    expect(again.headers.location).toBe(`/api/v1/runs/${res.body.id}`);
    const busy = await api("post", `/api/v1/runs/${res.body.id}/reanalyse`, fx.team.engineer);
    // The worker may already have finished it; then a third request is simply queued again.
    expect([202, 409]).toContain(busy.status);
    if (busy.status === 409) expectProblem(busy, 409);
    expect((await waitForRun(res.body.id, fx.team.viewer)).status).toBe("done");
    expectProblem(await api("post", `/api/v1/runs/${UNKNOWN_ID}/reanalyse`, fx.team.technician), 404);
  });
});

describe("GET /api/v1/runs/{runId}/capture", () => {
  it("redirects_to_a_presigned_download_of_the_unchanged_file", async () => {
    const res = await api("get", `/api/v1/runs/${analysed.id}/capture`, fx.team.viewer);
    expect(res.status).toBe(302);
    const file = await fetch(res.headers.location);
    expect(file.status).toBe(200);
    expect(await file.text()).toBe(analysed.csv);
    expect(file.headers.get("content-disposition")).toMatch(/capture\.csv/);
    expectProblem(await api("get", `/api/v1/runs/${UNKNOWN_ID}/capture`, fx.team.viewer), 404);
    expectProblem(await api("get", `/api/v1/runs/${analysed.id}/capture`, null), 401);
  });
});

describe("GET /api/v1/runs/{runId}/plot and results.json", () => {
  it("answers_the_plot_of_a_done_run_and_its_results_file", async () => {
    const plot = await api("get", `/api/v1/runs/${analysed.id}/plot`, fx.team.viewer);
    expect(plot.status).toBe(200);
    const body = expectDocumented(runPlotSchema, plot.body);
    expect(body.status).toBe("done");
    expect(body.plot).not.toBeNull();
    expect(body.specLimitDbc).toBe(-30);
    const file = await api("get", `/api/v1/runs/${analysed.id}/results.json`, fx.team.viewer);
    expect(file.status).toBe(200);
    expect(file.headers["content-disposition"]).toMatch(/attachment/);
    const saved = JSON.parse(file.text);
    expect(saved.run.results).toEqual(analysed.body.results);
    expectProblem(await api("get", `/api/v1/runs/${UNKNOWN_ID}/plot`, fx.team.viewer), 404);
    expectProblem(await api("get", `/api/v1/runs/${UNKNOWN_ID}/results.json`, fx.team.viewer), 404);
  });
});
