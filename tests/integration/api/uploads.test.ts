import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { uploadLimitBytes } from "@/lib/logbook/capture-files";
import { runAcceptedSchema } from "@/lib/openapi/schemas/run";
import { captureCsv, createFixture, expectDocumented, expectProblem, sendJson, UNKNOWN_ID, waitForRun, type Fixture } from "./helpers";

let fx: Fixture;

beforeAll(async () => {
  fx = await createFixture("uploads");
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

async function slot(body: Buffer, who = fx.team.technician, filename = "slot.csv") {
  const res = await sendJson("post", "/api/v1/uploads", who, { buildId: fx.buildId, filename, sizeBytes: body.length, contentType: "text/csv" });
  expect(res.status, res.text).toBe(201);
  return res.body as { slotId: string; runId: string; url: string; method: "PUT"; headers: Record<string, string>; expiresAt: string; maxBytes: number };
}

describe("POST /api/v1/uploads and /api/v1/uploads/{slotId}/complete", () => {
  it("hands_out_a_presigned_put_then_registers_the_stored_file_as_a_run", async () => {
    const body = Buffer.from(captureCsv(405e3, 71));
    const ticket = await slot(body);
    expect(ticket).toMatchObject({ method: "PUT", maxBytes: uploadLimitBytes() });
    expect(ticket.expiresAt).toMatch(/Z$/);
    const put = await fetch(ticket.url, { method: "PUT", headers: ticket.headers, body });
    expect(put.status).toBe(200);
    const done = await sendJson("post", `/api/v1/uploads/${ticket.slotId}/complete`, fx.team.technician, { channel: "Out", probe: "10x" });
    expect(done.status, done.text).toBe(201);
    expect(expectDocumented(runAcceptedSchema, done.body).id).toBe(ticket.runId);
    expect(done.headers.location).toBe(`/api/v1/runs/${ticket.runId}`);
    const run = await waitForRun(ticket.runId, fx.team.viewer);
    expect(run).toMatchObject({ status: "done", probeAttenuation: 10, channel: "Out" });

    // The same bytes again through a new slot: 409 naming the first run; the slot stays open for keepDuplicate.
    const again = await slot(body);
    expect((await fetch(again.url, { method: "PUT", headers: again.headers, body })).status).toBe(200);
    const dup = expectProblem(await sendJson("post", `/api/v1/uploads/${again.slotId}/complete`, fx.team.technician, {}), 409);
    expect(dup.existingRunId).toBe(ticket.runId);
    const kept = await sendJson("post", `/api/v1/uploads/${again.slotId}/complete`, fx.team.technician, { keepDuplicate: true });
    expect(kept.status, kept.text).toBe(201);
  });

  it("answers_413_over_the_limit_415_for_a_non_csv_404_for_an_unknown_build_and_400_for_bad_input", async () => {
    const base = { buildId: fx.buildId, filename: "big.csv", contentType: "text/csv" };
    expectProblem(await sendJson("post", "/api/v1/uploads", fx.team.technician, { ...base, sizeBytes: uploadLimitBytes() + 1 }), 413);
    expectProblem(await sendJson("post", "/api/v1/uploads", fx.team.technician, { ...base, filename: "scope.png", contentType: "image/png", sizeBytes: 10 }), 415);
    expectProblem(await sendJson("post", "/api/v1/uploads", fx.team.technician, { ...base, buildId: UNKNOWN_ID, sizeBytes: 10 }), 404);
    expect(expectProblem(await sendJson("post", "/api/v1/uploads", fx.team.technician, { ...base, sizeBytes: 0 }), 400).fields).toHaveProperty("sizeBytes");
    expectProblem(await sendJson("post", "/api/v1/uploads", fx.team.viewer, { ...base, sizeBytes: 10 }), 403);
    expectProblem(await sendJson("post", "/api/v1/uploads", null, { ...base, sizeBytes: 10 }), 401);
  });

  it("answers_400_before_the_file_arrived_and_404_for_someone_else's_or_an_unknown_slot", async () => {
    const body = Buffer.from(captureCsv(405e3, 72));
    const ticket = await slot(body);
    expectProblem(await sendJson("post", `/api/v1/uploads/${ticket.slotId}/complete`, fx.team.technician, {}), 400);
    expectProblem(await sendJson("post", `/api/v1/uploads/${ticket.slotId}/complete`, fx.team.engineer, {}), 404);
    expectProblem(await sendJson("post", `/api/v1/uploads/${UNKNOWN_ID}/complete`, fx.team.technician, {}), 404);
    expectProblem(await sendJson("post", `/api/v1/uploads/${ticket.slotId}/complete`, fx.team.technician, { probe: "none" }), 400);
    expectProblem(await sendJson("post", `/api/v1/uploads/${ticket.slotId}/complete`, fx.team.viewer, {}), 403);
  });
});
