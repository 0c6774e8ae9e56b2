import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { buildDetailSchema, buildListItemSchema, buildPageSchema, buildSchema } from "@/lib/openapi/schemas/build";
import { designDetailSchema, designSchema } from "@/lib/openapi/schemas/design";
import { tweakPageSchema, tweakSchema } from "@/lib/openapi/schemas/tweak";
import { api, createFixture, expectDocumented, expectProblem, sendJson, unique, UNKNOWN_ID, type Fixture } from "./helpers";

let fx: Fixture;

beforeAll(async () => {
  fx = await createFixture("designs");
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("GET /api/v1/designs/{designId}", () => {
  it("answers_the_design_with_prediction_bands_and_revision_history", async () => {
    const res = await api("get", `/api/v1/designs/${fx.designId}`, fx.team.viewer);
    expect(res.status).toBe(200);
    const design = expectDocumented(designDetailSchema, res.body);
    expect(design.revision).toBe(1);
    expect(design.revisions.map((r) => r.revision)).toEqual([1]);
    const p = design.prediction!;
    expect(p.worstCase.minHz).toBeLessThan(p.predictedHz);
    expect(p.worstCase.maxHz).toBeGreaterThan(p.predictedHz);
    expect(design.predictionError).toBeNull();
    expectProblem(await api("get", `/api/v1/designs/${UNKNOWN_ID}`, fx.team.viewer), 404);
    expectProblem(await api("get", `/api/v1/designs/${fx.designId}`, null), 401);
  });
});

describe("PATCH /api/v1/designs/{designId}", () => {
  it("adds_a_revision_keeping_the_parts_not_given", async () => {
    const own = await createFixture("revise", fx.team);
    const res = await sendJson("patch", `/api/v1/designs/${own.designId}`, fx.team.engineer, { parts: { C2: { value: "3n9" } }, changeNote: "C2 down" });
    expect(res.status, res.text).toBe(200);
    const design = expectDocumented(designSchema, res.body);
    expect(design.revision).toBe(2);
    expect(design.parts.C2.valueSi).toBeCloseTo(3.9e-9, 20);
    expect(design.parts.C1.valueSi).toBeCloseTo(2.2e-9, 20);
    const detail = await api("get", `/api/v1/designs/${own.designId}`, fx.team.viewer);
    expect(detail.body.revisions.map((r: { revision: number }) => r.revision)).toEqual([2, 1]);
  });

  it("answers_400_for_a_part_the_topology_lacks_403_below_engineer_and_404_for_an_unknown_design", async () => {
    const bad = expectProblem(await sendJson("patch", `/api/v1/designs/${fx.designId}`, fx.team.engineer, { parts: { C9: { value: "1n" } } }), 400);
    expect(Object.keys(bad.fields ?? {}).join(" ")).toMatch(/parts\.C9/);
    expectProblem(await sendJson("patch", `/api/v1/designs/${fx.designId}`, fx.team.technician, { changeNote: "x" }), 403);
    expectProblem(await sendJson("patch", `/api/v1/designs/${UNKNOWN_ID}`, fx.team.engineer, { changeNote: "x" }), 404);
  });
});

describe("/api/v1/designs/{designId}/builds", () => {
  it("starts_builds_for_technicians_with_as_built_values_from_the_design_and_lists_them", async () => {
    const label = unique("PCB");
    const res = await sendJson("post", `/api/v1/designs/${fx.designId}/builds`, fx.team.technician, { label, kind: "pcb", kindRevision: "rev B" });
    expect(res.status, res.text).toBe(201);
    const build = expectDocumented(buildSchema, res.body);
    expect(res.headers.location).toBe(`/api/v1/builds/${build.id}`);
    expect(build).toMatchObject({ label, kind: "pcb", kindRevision: "rev B", status: "open", builtBy: fx.team.technician.id });
    expect(build.asBuilt.L.valueSi).toBeCloseTo(100e-6, 15);

    const list = await api("get", `/api/v1/designs/${fx.designId}/builds`, fx.team.viewer).query({ kind: "pcb" });
    expect(list.status).toBe(200);
    const page = expectDocumented(buildPageSchema, list.body);
    for (const item of page.items) expectDocumented(buildListItemSchema, item);
    expect(page.items.map((b) => b.id)).toContain(build.id);
    expect(page.items.every((b) => b.kind === "pcb")).toBe(true);
  });

  it("answers_400_409_403_404_as_documented", async () => {
    const label = unique("BB");
    expect((await sendJson("post", `/api/v1/designs/${fx.designId}/builds`, fx.team.technician, { label, kind: "breadboard" })).status).toBe(201);
    const bad = expectProblem(await sendJson("post", `/api/v1/designs/${fx.designId}/builds`, fx.team.technician, { label: unique("x"), kind: "wirewrap" }), 400);
    expect(bad.fields).toHaveProperty("kind");
    expectProblem(await sendJson("post", `/api/v1/designs/${fx.designId}/builds`, fx.team.engineer, { label, kind: "breadboard" }), 409);
    expectProblem(await sendJson("post", `/api/v1/designs/${fx.designId}/builds`, fx.team.viewer, { label: unique("x"), kind: "breadboard" }), 403);
    expectProblem(await sendJson("post", `/api/v1/designs/${UNKNOWN_ID}/builds`, fx.team.technician, { label: unique("x"), kind: "breadboard" }), 404);
    expectProblem(await api("get", `/api/v1/designs/${UNKNOWN_ID}/builds`, fx.team.viewer), 404);
    expectProblem(await api("get", `/api/v1/designs/${fx.designId}/builds`, fx.team.viewer).query({ status: "lost" }), 400);
  });
});

describe("GET /api/v1/builds/{buildId}", () => {
  it("answers_the_build_with_its_prediction_tweaks_and_open_flags", async () => {
    const res = await api("get", `/api/v1/builds/${fx.buildId}`, fx.team.viewer);
    expect(res.status).toBe(200);
    const build = expectDocumented(buildDetailSchema, res.body);
    expect(build.topology).toBe("colpitts");
    expect(build.prediction!.predictedHz).toBeGreaterThan(400e3);
    expectProblem(await api("get", `/api/v1/builds/${UNKNOWN_ID}`, fx.team.viewer), 404);
    expectProblem(await api("get", `/api/v1/builds/${fx.buildId}`, null), 401);
  });
});

describe("/api/v1/builds/{buildId}/tweaks", () => {
  it("logs_an_applied_tweak_that_changes_the_as_built_value_and_a_planned_one_that_does_not", async () => {
    const own = await createFixture("tweaks", fx.team);
    const applied = await sendJson("post", `/api/v1/builds/${own.buildId}/tweaks`, fx.team.technician, { partRef: "C2", toValue: "3n9", note: "pull it up" });
    expect(applied.status, applied.text).toBe(201);
    const tweak = expectDocumented(tweakSchema, applied.body);
    expect(tweak).toMatchObject({ partRef: "C2", planned: false, note: "pull it up" });
    expect(tweak.fromValue).toBeCloseTo(4.7e-9, 20);
    expect(tweak.toValue).toBeCloseTo(3.9e-9, 20);
    const planned = await sendJson("post", `/api/v1/builds/${own.buildId}/tweaks`, fx.team.technician, { partRef: "C1", toValue: 2.7e-9, planned: true });
    expect(planned.status).toBe(201);

    const build = await api("get", `/api/v1/builds/${own.buildId}`, fx.team.viewer);
    expect(build.body.asBuilt.C2.valueSi).toBeCloseTo(3.9e-9, 20);
    expect(build.body.asBuilt.C1.valueSi).toBeCloseTo(2.2e-9, 20);
    const list = await api("get", `/api/v1/builds/${own.buildId}/tweaks`, fx.team.viewer);
    const page = expectDocumented(tweakPageSchema, list.body);
    expect(page.items.map((t) => t.id)).toEqual([tweak.id, planned.body.id]);
    expect(page.nextCursor).toBeNull();
  });

  it("answers_400_for_an_empty_tweak_or_unknown_part_403_for_viewers_and_404_for_an_unknown_build", async () => {
    expectProblem(await sendJson("post", `/api/v1/builds/${fx.buildId}/tweaks`, fx.team.technician, {}), 400);
    const unknownPart = expectProblem(await sendJson("post", `/api/v1/builds/${fx.buildId}/tweaks`, fx.team.technician, { partRef: "C7", toValue: "1n" }), 400);
    expect(unknownPart.fields).toHaveProperty("partRef");
    expectProblem(await sendJson("post", `/api/v1/builds/${fx.buildId}/tweaks`, fx.team.viewer, { note: "x" }), 403);
    expectProblem(await sendJson("post", `/api/v1/builds/${UNKNOWN_ID}/tweaks`, fx.team.technician, { note: "x" }), 404);
    expectProblem(await api("get", `/api/v1/builds/${UNKNOWN_ID}/tweaks`, fx.team.viewer), 404);
  });
});
