import type { Test } from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { buildOpenApiDocument, ROLE_EXTENSION } from "@/lib/openapi";
import { api, captureCsv, createFixture, expectProblem, roles, sendJson, unique, uploadCapture, waitForRun, type ApiPerson, type Fixture, type Role } from "./helpers";

// Every mutation of /api/v1 × every role, through API tokens. The lowest role per operation is written out here
// from the role table (accounts issue: viewers read; technicians build, tweak and upload; engineers write
// projects and designs and review), independently of lib/auth/permissions.ts and of the document.
const MINIMUM_ROLE: Record<string, Role> = {
  "POST /api/v1/projects": "engineer",
  "PATCH /api/v1/projects/{projectId}": "engineer",
  "POST /api/v1/projects/{projectId}/designs": "engineer",
  "PATCH /api/v1/designs/{designId}": "engineer",
  "POST /api/v1/designs/{designId}/builds": "technician",
  "POST /api/v1/builds/{buildId}/tweaks": "technician",
  "POST /api/v1/builds/{buildId}/tweaks/{tweakId}/apply": "technician",
  "PATCH /api/v1/builds/{buildId}": "technician",
  "POST /api/v1/builds/{buildId}/runs": "technician",
  "POST /api/v1/runs/{runId}/reanalyse": "technician",
  // Withdrawing a run from the figures: whoever edits the build (technicians and above).
  "POST /api/v1/runs/{runId}/withdrawal": "technician",
  "DELETE /api/v1/runs/{runId}/withdrawal": "technician",
  "POST /api/v1/uploads": "technician",
  "POST /api/v1/uploads/{slotId}/complete": "technician",
  "POST /api/v1/builds/{buildId}/review": "engineer",
  "POST /api/v1/flags/{flagId}/acknowledge": "engineer",
  "POST /api/v1/builds/{buildId}/retune": "technician",
  "PUT /api/v1/builds/{buildId}/follow": "viewer",
  "DELETE /api/v1/builds/{buildId}/follow": "viewer",
  "PUT /api/v1/projects/{projectId}/follow": "viewer",
  "DELETE /api/v1/projects/{projectId}/follow": "viewer",
};
/** Public writes (signing in and out) are not role-checked. */
const PUBLIC = ["POST /api/v1/session", "DELETE /api/v1/session"];

const rank = (role: Role) => roles.indexOf(role);

let fx: Fixture;
let runId: string;
let flagIds: string[];
let seed = 1000;

beforeAll(async () => {
  fx = await createFixture("matrix");
  // One analysed run 4 % below target: something to re-analyse, flags to acknowledge, a retune to plan.
  const res = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(395e3, 901));
  expect(res.status, res.text).toBe(201);
  runId = res.body.id;
  const run = await waitForRun(runId, fx.team.viewer);
  flagIds = (run.flags as { id: string }[]).map((f) => f.id);
  expect(flagIds.length).toBeGreaterThan(0);
}, 120_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

/** A request that is valid apart from the caller's role. */
async function request(operation: string, who: ApiPerson | null): Promise<Test> {
  switch (operation) {
    case "POST /api/v1/projects":
      return sendJson("post", "/api/v1/projects", who, { name: unique("Matrix") });
    case "PATCH /api/v1/projects/{projectId}":
      return sendJson("patch", `/api/v1/projects/${fx.projectId}`, who, { purpose: unique("purpose") });
    case "POST /api/v1/projects/{projectId}/designs":
      return sendJson("post", `/api/v1/projects/${fx.projectId}/designs`, who, { name: unique("Tank"), topology: "tank", parts: { L: { value: "10u" }, C: { value: "1n" } } });
    case "PATCH /api/v1/designs/{designId}":
      return sendJson("patch", `/api/v1/designs/${fx.designId}`, who, { changeNote: unique("note") });
    case "POST /api/v1/designs/{designId}/builds":
      return sendJson("post", `/api/v1/designs/${fx.designId}/builds`, who, { label: unique("BB"), kind: "breadboard" });
    case "POST /api/v1/builds/{buildId}/tweaks":
      return sendJson("post", `/api/v1/builds/${fx.buildId}/tweaks`, who, { note: unique("note") });
    case "POST /api/v1/builds/{buildId}/tweaks/{tweakId}/apply":
      // A tweak id that is not there: an allowed caller gets 404, a refused one the role's 403 first.
      return api("post", `/api/v1/builds/${fx.buildId}/tweaks/00000000-0000-4000-8000-000000000000/apply`, who);
    case "PATCH /api/v1/builds/{buildId}":
      return sendJson("patch", `/api/v1/builds/${fx.buildId}`, who, { timebasePpm: 25 });
    case "POST /api/v1/builds/{buildId}/runs":
      return uploadCapture(fx.buildId, who, captureCsv(405e3, seed++));
    case "POST /api/v1/runs/{runId}/reanalyse":
      return api("post", `/api/v1/runs/${runId}/reanalyse`, who);
    // The first allowed role withdraws (200), the next ones find it withdrawn (409); DELETE then restores it.
    case "POST /api/v1/runs/{runId}/withdrawal":
      return sendJson("post", `/api/v1/runs/${runId}/withdrawal`, who, { reason: "role matrix" });
    case "DELETE /api/v1/runs/{runId}/withdrawal":
      return api("delete", `/api/v1/runs/${runId}/withdrawal`, who);
    case "POST /api/v1/uploads":
      return sendJson("post", "/api/v1/uploads", who, { buildId: fx.buildId, filename: "m.csv", sizeBytes: 1000 });
    case "POST /api/v1/uploads/{slotId}/complete": {
      // The slot must be the caller's own; a caller who may not upload cannot get one, so borrow the technician's.
      const owner = who && rank(who.role) >= rank("technician") ? who : fx.team.technician;
      const slot = await sendJson("post", "/api/v1/uploads", owner, { buildId: fx.buildId, filename: "m.csv", sizeBytes: 1000 });
      return sendJson("post", `/api/v1/uploads/${slot.body.slotId}/complete`, who, {});
    }
    case "POST /api/v1/builds/{buildId}/review":
      return sendJson("post", `/api/v1/builds/${fx.buildId}/review`, who, { decision: "reopen" });
    case "POST /api/v1/flags/{flagId}/acknowledge":
      return api("post", `/api/v1/flags/${flagIds[0]}/acknowledge`, who);
    case "POST /api/v1/builds/{buildId}/retune":
      return sendJson("post", `/api/v1/builds/${fx.buildId}/retune`, who, { series: "E12" });
    case "PUT /api/v1/builds/{buildId}/follow":
      return api("put", `/api/v1/builds/${fx.buildId}/follow`, who);
    case "DELETE /api/v1/builds/{buildId}/follow":
      return api("delete", `/api/v1/builds/${fx.buildId}/follow`, who);
    case "PUT /api/v1/projects/{projectId}/follow":
      return api("put", `/api/v1/projects/${fx.projectId}/follow`, who);
    case "DELETE /api/v1/projects/{projectId}/follow":
      return api("delete", `/api/v1/projects/${fx.projectId}/follow`, who);
  }
  throw new Error(`no request for ${operation}`);
}

describe("the role matrix of every /api/v1 mutation", () => {
  it("covers every mutation in the document, with the same lowest role the document states", () => {
    const { document } = buildOpenApiDocument();
    const mutations = Object.entries(document.paths).flatMap(([p, item]) =>
      Object.entries(item)
        .filter(([m]) => m !== "get")
        .map(([m, op]) => ({ key: `${m.toUpperCase()} ${p}`, role: (op as Record<string, unknown>)[ROLE_EXTENSION] })),
    );
    expect(mutations.map((m) => m.key).filter((k) => !PUBLIC.includes(k)).sort()).toEqual(Object.keys(MINIMUM_ROLE).sort());
    for (const m of mutations) if (!PUBLIC.includes(m.key)) expect(m.role, m.key).toBe(MINIMUM_ROLE[m.key]);
  });

  for (const [operation, minimum] of Object.entries(MINIMUM_ROLE)) {
    it(`${operation}: 401 without a token, 403 below ${minimum}, allowed from ${minimum} up`, async () => {
      expectProblem(await request(operation, null), 401);
      for (const role of roles) {
        const res = await request(operation, fx.team[role]);
        if (rank(role) < rank(minimum)) {
          const problem = expectProblem(res, 403);
          expect(problem.detail, `${role} on ${operation}`).toMatch(new RegExp(minimum));
        } else {
          // Allowed: whatever the domain answers (201, 200, 202, or 409 for a second acknowledge), never an auth refusal.
          expect([401, 403], `${role} on ${operation}: ${res.status} ${res.text.slice(0, 200)}`).not.toContain(res.status);
          expect(res.status, `${role} on ${operation}: ${res.text.slice(0, 200)}`).toBeLessThan(500);
        }
      }
    });
  }
});
