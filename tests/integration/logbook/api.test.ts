import { randomBytes } from "node:crypto";
import { generateIdFromEntropySize } from "lucia";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { createUser } from "@/db/queries/users";
import { createApiToken } from "@/lib/auth/api-tokens";
import { closeLucia } from "@/lib/auth/lucia";
import { roles, type Role } from "@/lib/auth/permissions";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { appUrl } from "../../helpers/stack";
import { waitFor } from "./scratch-stack";

// The /api/v1 logbook routes on the running app (npm test's stack: its database, fake S3 and embedded worker),
// called with API tokens of each role the way a bench script calls them.
const token = {} as Record<Role, string>;
let projectId: string;
let designId: string;
let buildId: string;

function api() {
  return request(appUrl());
}

function as(role: Role) {
  return { authorization: `Bearer ${token[role]}` };
}

function capture(frequencyHz: number, seed: number): Buffer {
  return Buffer.from(synthCaptureCsv({ frequencyHz, sampleRateHz: 20e6, samples: 8192, amplitudeV: 0.8, harmonicsDbc: [-38, -50], noiseVrms: 0.001, seed }));
}

function upload(role: Role, body: Buffer, fields: Record<string, string> = {}, filename = "bench.csv", headers: Record<string, string> = {}) {
  const req = api().post(`/api/v1/builds/${buildId}/runs`).set(as(role)).set(headers);
  for (const [k, v] of Object.entries(fields)) req.field(k, v);
  return req.attach("file", body, { filename, contentType: filename.endsWith(".csv") ? "text/csv" : "image/png" });
}

async function finished(runId: string) {
  return waitFor(`run ${runId} to be analysed`, async () => {
    const res = await api().get(`/api/v1/runs/${runId}`).set(as("viewer"));
    return res.body.status === "done" || res.body.status === "failed" ? res.body : undefined;
  }, 60_000, 300);
}

beforeAll(async () => {
  for (const role of roles) {
    const user = await createUser({
      id: generateIdFromEntropySize(10),
      email: `${role}-${randomBytes(4).toString("hex")}@logbook-api.test`,
      name: `API ${role}`,
      role,
      passwordHash: null,
    });
    token[role] = (await createApiToken({ userId: user.id, name: "logbook api test" })).token;
  }
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("projects and designs", () => {
  it("lets_engineers_create_projects_and_refuses_technicians_and_strangers", async () => {
    const name = `API bench ${randomBytes(3).toString("hex")}`;
    expect((await api().post("/api/v1/projects").send({ name })).status).toBe(401);
    const refused = await api().post("/api/v1/projects").set(as("technician")).send({ name });
    expect(refused.status).toBe(403);
    expect(refused.headers["content-type"]).toMatch(/application\/problem\+json/);
    const res = await api().post("/api/v1/projects").set(as("engineer")).send({ name, purpose: "bench API checks" });
    expect(res.status).toBe(201);
    expect(res.headers.location).toBe(`/api/v1/projects/${res.body.id}`);
    projectId = res.body.id;
    expect((await api().post("/api/v1/projects").set(as("engineer")).send({ name })).status).toBe(409);
    const list = await api().get("/api/v1/projects").query({ limit: 200 }).set(as("viewer"));
    expect(list.status).toBe(200);
    expect(list.body.items.some((p: { id: string }) => p.id === projectId)).toBe(true);
    expect(list.body).toHaveProperty("nextCursor");
  });

  it("creates_a_design_with_its_prediction_and_names_the_bad_field", async () => {
    const bad = await api()
      .post(`/api/v1/projects/${projectId}/designs`)
      .set(as("engineer"))
      .send({ name: "Bad", topology: "tank", parts: { L: { value: "4.7q" }, C: { value: "1n" } } });
    expect(bad.status).toBe(400);
    expect(bad.body.fields["parts.L.value"][0]).toMatch(/"4.7q" is not a value/);
    const body = {
      name: "Clapp 3.5M",
      topology: "clapp",
      parts: { L: { value: "4.7u", tolerance: "5%" }, C1: { value: "1n" }, C2: { value: "1n" }, C3: { value: "470p" } },
      spec: { targetHz: "3.5M", toleranceValue: 3, toleranceUnit: "percent", maxHarmonicDbc: -30 },
    };
    expect((await api().post(`/api/v1/projects/${projectId}/designs`).set(as("technician")).send(body)).status).toBe(403);
    const res = await api().post(`/api/v1/projects/${projectId}/designs`).set(as("engineer")).send(body);
    expect(res.status).toBe(201);
    designId = res.body.id;
    expect(res.body.prediction.predictedHz).toBeGreaterThan(3e6);
    expect(res.body.prediction.worstCase.minHz).toBeLessThan(res.body.prediction.predictedHz);
    const got = await api().get(`/api/v1/designs/${designId}`).set(as("viewer"));
    expect(got.status).toBe(200);
    expect(got.body.revisions).toHaveLength(1);
  });

  it("lets_only_engineers_edit_a_spec_which_makes_a_new_revision", async () => {
    const patch = { spec: { targetHz: "3.4M", toleranceValue: 5, toleranceUnit: "percent", maxHarmonicDbc: -30 } };
    expect((await api().patch(`/api/v1/designs/${designId}`).set(as("technician")).send(patch)).status).toBe(403);
    const res = await api().patch(`/api/v1/designs/${designId}`).set(as("engineer")).send(patch);
    expect(res.status).toBe(200);
    expect(res.body.revision).toBe(2);
    expect(res.body.spec.targetHz).toBe(3.4e6);
  });

  it("lets_only_engineers_rename_a_project", async () => {
    expect((await api().patch(`/api/v1/projects/${projectId}`).set(as("technician")).send({ purpose: "x" })).status).toBe(403);
    const res = await api().patch(`/api/v1/projects/${projectId}`).set(as("engineer")).send({ purpose: "bench API checks, renamed" });
    expect(res.status).toBe(200);
    expect(res.body.purpose).toBe("bench API checks, renamed");
  });

  it("answers_404_for_unknown_ids", async () => {
    expect((await api().get("/api/v1/designs/00000000-0000-4000-8000-000000000000").set(as("viewer"))).status).toBe(404);
    expect((await api().get("/api/v1/runs/not-a-run").set(as("viewer"))).status).toBe(404);
  });
});

describe("builds, tweaks and runs", () => {
  it("lets_technicians_start_builds_and_log_tweaks_but_not_viewers", async () => {
    const build = { label: `PCB-${randomBytes(2).toString("hex")}`, kind: "pcb", kindRevision: "rev A" };
    expect((await api().post(`/api/v1/designs/${designId}/builds`).set(as("viewer")).send(build)).status).toBe(403);
    const res = await api().post(`/api/v1/designs/${designId}/builds`).set(as("technician")).send(build);
    expect(res.status).toBe(201);
    buildId = res.body.id;
    expect(res.body.asBuilt.C3.valueSi).toBeCloseTo(470e-12, 20);
    expect((await api().post(`/api/v1/builds/${buildId}/tweaks`).set(as("viewer")).send({ note: "x" })).status).toBe(403);
    const tweak = await api().post(`/api/v1/builds/${buildId}/tweaks`).set(as("technician")).send({ partRef: "C3", toValue: "390p", note: "C3 one step down" });
    expect(tweak.status).toBe(201);
    expect(tweak.body.fromValue).toBeCloseTo(470e-12, 20);
    const got = await api().get(`/api/v1/builds/${buildId}`).set(as("viewer"));
    expect(got.body.asBuilt.C3.valueSi).toBeCloseTo(390e-12, 20);
    expect(got.body.tweaks).toHaveLength(1);
  });

  it("uploads_a_capture_by_multipart_and_reads_its_analysis", async () => {
    const body = capture(3.62e6, 5);
    expect((await upload("viewer", body)).status).toBe(403);
    const fields = { channel: "Out", probe: "10", supplyV: "12", temperatureC: "24", note: "from the bench" };
    const res = await upload("technician", body, fields, "bench.csv", {
      "idempotency-key": "api-test-1",
    });
    expect(res.status).toBe(201);
    expect(res.body.status).toBe("queued");
    expect(res.headers.location).toBe(`/api/v1/runs/${res.body.id}`);
    // A retry repeats the request exactly; other details under the same key would be a 422.
    const retry = await upload("technician", body, fields, "bench.csv", { "idempotency-key": "api-test-1" });
    expect(retry.status).toBe(200);
    expect(retry.body.id).toBe(res.body.id);
    const duplicate = await upload("technician", body);
    expect(duplicate.status).toBe(409);
    expect(duplicate.body.existingRunId).toBe(res.body.id);

    const run = await finished(res.body.id);
    expect(run.status).toBe("done");
    expect(Object.keys(run)).toEqual(expect.arrayContaining(["id", "buildId", "status", "createdAt", "results", "predictedHz", "driftPpm", "impliedExtraCapacitanceF", "verdict", "flags", "error"]));
    expect(run.createdAt).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
    expect(run.results.frequencyHz / 3.62e6 - 1).toBeLessThan(1e-6);
    expect(run.results).toHaveProperty("harmonics");
    expect(run.results).toHaveProperty("warnings");
    expect(run.probeAttenuation).toBe(10);
    expect(run.snapshot.parts.C3.valueSi).toBeCloseTo(390e-12, 20);
    expect(["pass", "fail"]).toContain(run.verdict);

    const plot = await api().get(`/api/v1/runs/${run.id}/plot`).set(as("viewer"));
    expect(plot.status).toBe(200);
    expect(plot.body.plot.spectrum.frequencyHz.length).toBeGreaterThan(10);
    const raw = await api().get(`/api/v1/runs/${run.id}/capture`).set(as("viewer"));
    expect(raw.status).toBe(302);
    const file = await fetch(raw.headers.location);
    expect(Buffer.from(await file.arrayBuffer()).equals(body)).toBe(true);
  });

  it("refuses_a_non_csv_with_415_and_a_slot_over_the_limit_with_413", async () => {
    expect((await upload("technician", Buffer.from("not a capture"), {}, "scope.png")).status).toBe(415);
    const big = await api().post("/api/v1/uploads").set(as("technician")).send({ buildId, filename: "big.csv", sizeBytes: 2 * 1024 ** 4 });
    expect(big.status).toBe(413);
    expect(big.body.title).toBe("Payload too large");
  });

  it("uploads_through_a_presigned_slot_and_registers_the_run", async () => {
    const body = capture(3.58e6, 9);
    expect((await api().post("/api/v1/uploads").set(as("viewer")).send({ buildId, filename: "slot.csv", sizeBytes: body.length })).status).toBe(403);
    expect((await api().post("/api/v1/uploads/00000000-0000-4000-8000-000000000000/complete").set(as("viewer")).send({})).status).toBe(403);
    const slot = await api().post("/api/v1/uploads").set(as("technician")).send({ buildId, filename: "slot.csv", sizeBytes: body.length, contentType: "text/csv" });
    expect(slot.status).toBe(201);
    const put = await fetch(slot.body.url, { method: "PUT", headers: slot.body.headers, body: new Uint8Array(body) });
    expect(put.status).toBe(200);
    expect((await api().post(`/api/v1/uploads/${slot.body.slotId}/complete`).set(as("engineer")).send({})).status).toBe(404);
    const done = await api().post(`/api/v1/uploads/${slot.body.slotId}/complete`).set(as("technician")).send({ note: "via slot" });
    expect(done.status).toBe(201);
    expect(done.body.id).toBe(slot.body.runId);
    await finished(done.body.id);
  });

  it("lists_a_build_runs_with_cursor_pagination_and_filters", async () => {
    const first = await api().get(`/api/v1/builds/${buildId}/runs`).query({ limit: 1 }).set(as("viewer"));
    expect(first.status).toBe(200);
    expect(first.body.items).toHaveLength(1);
    expect(first.body.nextCursor).toEqual(expect.any(String));
    const second = await api().get(`/api/v1/builds/${buildId}/runs`).query({ limit: 1, cursor: first.body.nextCursor }).set(as("viewer"));
    expect(second.body.items).toHaveLength(1);
    expect(second.body.items[0].id).not.toBe(first.body.items[0].id);
    expect(second.body.nextCursor).toBeNull();
    const bad = await api().get(`/api/v1/builds/${buildId}/runs`).query({ cursor: "nonsense" }).set(as("viewer"));
    expect(bad.status).toBe(400);
    const tooMany = await api().get(`/api/v1/builds/${buildId}/runs`).query({ limit: 500 }).set(as("viewer"));
    expect(tooMany.status).toBe(400);
  });

  it("reanalyses_for_technicians_only_and_refuses_a_second_request_while_queued", async () => {
    const list = await api().get(`/api/v1/builds/${buildId}/runs`).query({ status: "done" }).set(as("viewer"));
    const runId = list.body.items[0].id;
    expect((await api().post(`/api/v1/runs/${runId}/reanalyse`).set(as("viewer"))).status).toBe(403);
    const res = await api().post(`/api/v1/runs/${runId}/reanalyse`).set(as("technician"));
    expect(res.status).toBe(202);
    const again = await api().post(`/api/v1/runs/${runId}/reanalyse`).set(as("technician"));
    expect([202, 409]).toContain(again.status);
    const run = await finished(runId);
    expect(run.status).toBe("done");
  });
});
