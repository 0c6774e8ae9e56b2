import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { designPageSchema, designSchema } from "@/lib/openapi/schemas/design";
import { projectListItemSchema, projectPageSchema, projectSchema } from "@/lib/openapi/schemas/project";
import { api, createRoleTeam, expectDocumented, expectProblem, sendJson, unique, UNKNOWN_ID, COLPITTS_PARTS, type ApiPerson, type Role } from "./helpers";

let team: Record<Role, ApiPerson>;

beforeAll(async () => {
  team = await createRoleTeam("projects");
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

async function newProject(name = unique("Project")) {
  const res = await sendJson("post", "/api/v1/projects", team.engineer, { name, purpose: "api tests" });
  expect(res.status, res.text).toBe(201);
  return res.body as { id: string; name: string };
}

describe("POST /api/v1/projects", () => {
  it("creates_a_project_answering_201_with_its_location_and_documented_shape", async () => {
    const name = unique("Reference oscillators");
    const res = await sendJson("post", "/api/v1/projects", team.engineer, { name, purpose: "Low-drift sources" });
    expect(res.status).toBe(201);
    const project = expectDocumented(projectSchema, res.body);
    expect(res.headers.location).toBe(`/api/v1/projects/${project.id}`);
    expect(project).toMatchObject({ name, purpose: "Low-drift sources", ownerId: team.engineer.id, ownerName: team.engineer.name });
    expect(project.createdAt).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d(\.\d+)?Z$/);
  });

  it("answers_400_naming_the_field_for_a_missing_name_and_for_a_body_that_is_not_json", async () => {
    const missing = expectProblem(await sendJson("post", "/api/v1/projects", team.engineer, { purpose: "no name" }), 400);
    expect(missing.fields).toHaveProperty("name");
    expectProblem(await api("post", "/api/v1/projects", team.engineer).set("content-type", "application/json").send("{not json"), 400);
    expectProblem(await api("post", "/api/v1/projects", team.engineer).set("content-type", "text/plain").send("name=x"), 400);
  });

  it("answers_409_for_a_name_taken", async () => {
    const { name } = await newProject();
    expectProblem(await sendJson("post", "/api/v1/projects", team.admin, { name }), 409);
  });

  it("answers_401_without_a_token_and_403_below_engineer", async () => {
    expectProblem(await sendJson("post", "/api/v1/projects", null, { name: unique("x") }), 401);
    for (const role of ["viewer", "technician"] as const) {
      const body = expectProblem(await sendJson("post", "/api/v1/projects", team[role], { name: unique("x") }), 403);
      expect(body.detail).toMatch(/engineer/);
    }
  });
});

describe("GET /api/v1/projects", () => {
  it("pages_with_a_cursor_until_next_cursor_is_null_without_repeats", async () => {
    const marker = unique("Paging");
    const made = [];
    for (let i = 0; i < 5; i++) made.push(await newProject(`${marker} ${i}`));
    const seen: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const res = await api("get", "/api/v1/projects", team.viewer).query({ q: marker, limit: 2, ...(cursor ? { cursor } : {}) });
      expect(res.status).toBe(200);
      const page = expectDocumented(projectPageSchema, res.body);
      for (const item of page.items) expectDocumented(projectListItemSchema, item);
      seen.push(...page.items.map((p) => p.id));
      cursor = page.nextCursor;
      pages++;
      expect(page.items.length).toBeLessThanOrEqual(2);
    } while (cursor !== null && pages < 10);
    expect(pages).toBe(3);
    expect(seen).toEqual(made.map((p) => p.id).reverse()); // newest first
  });

  it("answers_nextCursor_null_when_everything_fits_and_takes_limit_200", async () => {
    const marker = unique("Single");
    await newProject(`${marker} a`);
    const res = await api("get", "/api/v1/projects", team.viewer).query({ q: marker, limit: 200 });
    expect(res.status).toBe(200);
    expect(res.body.items).toHaveLength(1);
    expect(res.body.nextCursor).toBeNull();
  });

  it("answers_400_for_limit_over_200_or_below_1_and_401_without_a_token", async () => {
    for (const limit of ["201", "0", "ten"]) {
      const body = expectProblem(await api("get", "/api/v1/projects", team.viewer).query({ limit }), 400);
      expect(body.fields).toHaveProperty("limit");
    }
    expectProblem(await api("get", "/api/v1/projects", null), 401);
  });
});

describe("GET and PATCH /api/v1/projects/{projectId}", () => {
  it("reads_a_project_and_answers_404_for_unknown_and_malformed_ids", async () => {
    const project = await newProject();
    const res = await api("get", `/api/v1/projects/${project.id}`, team.viewer);
    expect(res.status).toBe(200);
    expect(expectDocumented(projectSchema, res.body).id).toBe(project.id);
    expectProblem(await api("get", `/api/v1/projects/${UNKNOWN_ID}`, team.viewer), 404);
    expectProblem(await api("get", "/api/v1/projects/not-an-id", team.viewer), 404);
    expectProblem(await api("get", `/api/v1/projects/${project.id}`, null), 401);
  });

  it("renames_for_engineers_and_answers_403_400_404_409", async () => {
    const project = await newProject();
    const other = await newProject();
    const renamed = unique("Renamed");
    const res = await sendJson("patch", `/api/v1/projects/${project.id}`, team.engineer, { name: renamed });
    expect(res.status, res.text).toBe(200);
    expect(expectDocumented(projectSchema, res.body).name).toBe(renamed);
    expectProblem(await sendJson("patch", `/api/v1/projects/${project.id}`, team.technician, { name: unique("x") }), 403);
    expectProblem(await sendJson("patch", `/api/v1/projects/${project.id}`, team.engineer, { name: "" }), 400);
    expectProblem(await sendJson("patch", `/api/v1/projects/${UNKNOWN_ID}`, team.engineer, { name: unique("x") }), 404);
    expectProblem(await sendJson("patch", `/api/v1/projects/${project.id}`, team.engineer, { name: other.name }), 409);
  });
});

describe("/api/v1/projects/{projectId}/designs", () => {
  it("creates_a_design_with_its_prediction_and_lists_it", async () => {
    const project = await newProject();
    const res = await sendJson("post", `/api/v1/projects/${project.id}/designs`, team.engineer, {
      name: "Colpitts 411k",
      topology: "colpitts",
      parts: COLPITTS_PARTS,
      spec: { targetHz: "411k", toleranceValue: 2, toleranceUnit: "percent" },
    });
    expect(res.status, res.text).toBe(201);
    const design = expectDocumented(designSchema, res.body);
    expect(res.headers.location).toBe(`/api/v1/designs/${design.id}`);
    expect(design.parts.C1.valueSi).toBeCloseTo(2.2e-9, 20);
    // Colpitts: f = 1/(2π√(L·C1C2/(C1+C2))) with L 100 µH, C1 2.2 nF, C2 4.7 nF → 411.1 kHz (common practice).
    const cSeries = (2.2e-9 * 4.7e-9) / (2.2e-9 + 4.7e-9);
    const expectedHz = 1 / (2 * Math.PI * Math.sqrt(100e-6 * cSeries));
    expect(Math.abs(design.prediction!.predictedHz / expectedHz - 1)).toBeLessThan(1e-9);
    expect(design.spec.targetHz).toBe(411e3);

    const list = await api("get", `/api/v1/projects/${project.id}/designs`, team.viewer);
    expect(list.status).toBe(200);
    const page = expectDocumented(designPageSchema, list.body);
    expect(page.items.map((d) => d.id)).toEqual([design.id]);
    expect(page.nextCursor).toBeNull();
  });

  it("answers_400_with_the_failing_part_409_for_a_taken_name_403_below_engineer_and_404_for_an_unknown_project", async () => {
    const project = await newProject();
    const good = { name: "Tank", topology: "tank", parts: { L: { value: "10u" }, C: { value: "1n" } } };
    const bad = expectProblem(await sendJson("post", `/api/v1/projects/${project.id}/designs`, team.engineer, { ...good, parts: { L: { value: "10u" }, C: { value: "banana" } } }), 400);
    expect(Object.keys(bad.fields ?? {})).toContain("parts.C.value");
    expect((await sendJson("post", `/api/v1/projects/${project.id}/designs`, team.engineer, good)).status).toBe(201);
    expectProblem(await sendJson("post", `/api/v1/projects/${project.id}/designs`, team.admin, good), 409);
    expectProblem(await sendJson("post", `/api/v1/projects/${project.id}/designs`, team.technician, { ...good, name: "Other" }), 403);
    expectProblem(await sendJson("post", `/api/v1/projects/${UNKNOWN_ID}/designs`, team.engineer, { ...good, name: "Other" }), 404);
    expectProblem(await api("get", `/api/v1/projects/${UNKNOWN_ID}/designs`, team.viewer), 404);
    expectProblem(await api("get", `/api/v1/projects/${project.id}/designs`, team.viewer).query({ limit: 500 }), 400);
  });
});
