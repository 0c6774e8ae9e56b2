import Papa from "papaparse";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { listRunFlags } from "@/db/queries/flags";
import { listRunsForExport } from "@/db/queries/exports";
import { createApiToken } from "@/lib/auth/api-tokens";
import { closeLucia } from "@/lib/auth/lucia";
import { roles, type Role } from "@/lib/auth/permissions";
import { refusalMessage } from "@/lib/auth/require-permission";
import { RUN_CSV_COLUMNS } from "@/lib/exports/runs-csv";
import { appUrl } from "../../helpers/stack";
import { auditFor, failing, finishRun, logRun, makeBuild, makePerson, type BuildFixture } from "./fixtures";

// The review routes on the running app (npm test's stack), called with API tokens of each role as a bench
// script would; the data is made straight in the app's database.
const token = {} as Record<Role, string>;
const person = {} as Record<Role, Awaited<ReturnType<typeof makePerson>>>;

function api() {
  return request(appUrl());
}

function as(role: Role) {
  return { authorization: `Bearer ${token[role]}` };
}

async function flaggedBuild(): Promise<{ fx: BuildFixture; runId: string }> {
  const fx = await makeBuild({ owner: person.engineer, builtBy: person.technician });
  const runId = await logRun(fx, person.technician, "=SUM(A1).csv");
  await finishRun(fx, runId, [failing("harmonic-2", -33.5)], { measuredHz: 2_201_234.5678 });
  return { fx, runId };
}

beforeAll(async () => {
  for (const role of roles) {
    person[role] = await makePerson(role, `api-${role}`);
    token[role] = (await createApiToken({ userId: person[role].id, name: "review api test" })).token;
  }
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("POST /api/v1/builds/{id}/review", () => {
  for (const role of ["viewer", "technician"] as const) {
    it(`${role}s_are_refused_with_403_problem_json`, async () => {
      const { fx } = await flaggedBuild();
      const res = await api().post(`/api/v1/builds/${fx.buildId}/review`).set(as(role)).send({ decision: "accept", reason: "looks fine" });
      expect(res.status).toBe(403);
      expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
      expect(res.body.detail).toBe(refusalMessage(role, "build:review"));
      const reject = await api().post(`/api/v1/builds/${fx.buildId}/review`).set(as(role)).send({ decision: "reject", comment: "no" });
      expect(reject.status).toBe(403);
    });
  }

  it("anonymous_is_401", async () => {
    const { fx } = await flaggedBuild();
    const res = await api().post(`/api/v1/builds/${fx.buildId}/review`).send({ decision: "accept", reason: "x" });
    expect(res.status).toBe(401);
  });

  it("accepting_a_flagged_build_without_a_reason_is_400_with_a_reason_field", async () => {
    const { fx } = await flaggedBuild();
    const res = await api().post(`/api/v1/builds/${fx.buildId}/review`).set(as("engineer")).send({ decision: "accept", reason: "  " });
    expect(res.status).toBe(400);
    expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect(res.body.fields.reason[0]).toMatch(/latest run of this build is flagged/);
    expect(await auditFor("build.accepted", fx.buildId)).toHaveLength(0);
  });

  it("accepting_it_with_a_reason_is_200_and_audited", async () => {
    const { fx, runId } = await flaggedBuild();
    const res = await api()
      .post(`/api/v1/builds/${fx.buildId}/review`)
      .set(as("engineer"))
      .set("x-forwarded-for", "198.51.100.7")
      .send({ decision: "accept", comment: "ok for the pilot", reason: "H2 is removed by the LPF on the product board." });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ build: { id: fx.buildId, status: "accepted", reviewComment: "ok for the pilot" }, signOff: { runId }, flaggedRules: ["harmonic-2"] });
    const [row] = await auditFor("build.accepted", fx.buildId);
    expect(row).toMatchObject({ actor_id: person.engineer.id, ip: "198.51.100.7" });
    expect(row.detail).toMatchObject({ flagged: true, reason: "H2 is removed by the LPF on the product board." });
  });

  it("rejecting_needs_a_comment_and_bad_bodies_are_400", async () => {
    const { fx } = await flaggedBuild();
    const noComment = await api().post(`/api/v1/builds/${fx.buildId}/review`).set(as("admin")).send({ decision: "reject" });
    expect(noComment.status).toBe(400);
    expect(noComment.body.fields.comment).toEqual(["Say why the build is rejected."]);
    const bad = await api().post(`/api/v1/builds/${fx.buildId}/review`).set(as("admin")).send({ decision: "sign" });
    expect(bad.status).toBe(400);
    const ok = await api().post(`/api/v1/builds/${fx.buildId}/review`).set(as("admin")).send({ status: "rejected", comment: "wrong overtone" });
    expect(ok.status).toBe(200);
    expect(ok.body.build.status).toBe("rejected");
  });

  it("an_unknown_or_malformed_build_is_404", async () => {
    for (const id of ["00000000-0000-4000-8000-000000000000", "not-an-id"]) {
      const res = await api().post(`/api/v1/builds/${id}/review`).set(as("engineer")).send({ decision: "accept" });
      expect(res.status).toBe(404);
    }
  });
});

describe("POST /api/v1/flags/{id}/acknowledge", () => {
  it("technicians_403_engineers_200_then_409", async () => {
    const { runId } = await flaggedBuild();
    const [flag] = await listRunFlags(runId);
    expect((await api().post(`/api/v1/flags/${flag.id}/acknowledge`).set(as("technician"))).status).toBe(403);
    const ok = await api().post(`/api/v1/flags/${flag.id}/acknowledge`).set(as("engineer"));
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ id: flag.id, rule: "harmonic-2" });
    expect((await api().post(`/api/v1/flags/${flag.id}/acknowledge`).set(as("engineer"))).status).toBe(409);
  });
});

describe("GET /api/v1/builds/{id}/runs.csv", () => {
  it("downloads_the_filtered_rows_as_csv_that_parses_back_to_the_same_rows", async () => {
    const { fx } = await flaggedBuild();
    const passing = await logRun(fx, person.technician, "plain.csv");
    await finishRun(fx, passing, [], { measuredHz: 2_250_000.125 });
    await logRun(fx, person.technician, "queued.csv");

    const res = await api().get(`/api/v1/builds/${fx.buildId}/runs.csv`).set(as("viewer"));
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^text\/csv; charset=utf-8/);
    expect(res.headers["content-disposition"]).toMatch(/^attachment; filename="tankbook-runs-BB-[0-9a-f]+-\d{4}-\d{2}-\d{2}\.csv"$/);
    const parsed = Papa.parse<string[]>(res.text, { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data[0]).toEqual(RUN_CSV_COLUMNS.map((c) => c.header));
    const rows = await listRunsForExport(fx.buildId);
    expect(parsed.data.slice(1)).toEqual(
      rows.map((r) => RUN_CSV_COLUMNS.map((c) => {
        const v = c.value(r);
        return v === null ? "" : typeof v === "number" ? String(v) : /^[=+\-@\t\r]/.test(v) ? `'${v}` : v;
      })),
    );
    expect(parsed.data.map((r) => r[2])).toEqual(["File", "queued.csv", "plain.csv", "'=SUM(A1).csv"]);

    const failOnly = await api().get(`/api/v1/builds/${fx.buildId}/runs.csv?verdict=fail`).set(as("viewer"));
    const failRows = Papa.parse<string[]>(failOnly.text, { skipEmptyLines: true }).data;
    expect(failRows).toHaveLength(2);
    expect(failRows[1][RUN_CSV_COLUMNS.findIndex((c) => c.header === "Failed rules")]).toBe("harmonic-2");
  });

  it("refuses_bad_filters_unknown_builds_and_anonymous_callers", async () => {
    const { fx } = await flaggedBuild();
    const bad = await api().get(`/api/v1/builds/${fx.buildId}/runs.csv?verdict=maybe`).set(as("viewer"));
    expect(bad.status).toBe(400);
    expect(bad.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect((await api().get(`/api/v1/builds/00000000-0000-4000-8000-000000000000/runs.csv`).set(as("viewer"))).status).toBe(404);
    expect((await api().get(`/api/v1/builds/${fx.buildId}/runs.csv`)).status).toBe(401);
  });
});

describe("GET /api/v1/runs/{id}/results.json", () => {
  it("downloads_a_done_run_as_a_json_attachment_and_refuses_an_unfinished_one", async () => {
    const { fx, runId } = await flaggedBuild();
    const res = await api().get(`/api/v1/runs/${runId}/results.json`).set(as("viewer"));
    expect(res.status).toBe(200);
    expect(res.headers["content-disposition"]).toBe(`attachment; filename="tankbook-run-${runId}-results.json"`);
    const doc = JSON.parse(res.text);
    expect(doc).toMatchObject({ format: "tankbook-run-results", formatVersion: 1, build: { id: fx.buildId, label: fx.label }, run: { id: runId, status: "done", verdict: "fail" } });
    expect(doc.run.flags.map((f: { rule: string }) => f.rule)).toEqual(["harmonic-2"]);
    const queued = await logRun(fx, person.technician);
    expect((await api().get(`/api/v1/runs/${queued}/results.json`).set(as("viewer"))).status).toBe(409);
  });
});

describe("follow routes", () => {
  it("put_and_delete_change_the_callers_follow", async () => {
    const { fx } = await flaggedBuild();
    const path = `/api/v1/builds/${fx.buildId}/follow`;
    expect((await api().get(path).set(as("viewer"))).body).toMatchObject({ following: false });
    expect((await api().put(path).set(as("viewer"))).body).toMatchObject({ following: true, via: "build" });
    expect((await api().delete(path).set(as("technician"))).body).toMatchObject({ following: false, isMaker: true });
    const project = `/api/v1/projects/${fx.projectId}/follow`;
    expect((await api().put(project).set(as("viewer"))).body).toEqual({ following: true });
    expect((await api().get(project).set(as("viewer"))).body).toEqual({ following: true });
    expect((await api().delete(project).set(as("viewer"))).body).toEqual({ following: false });
  });
});

describe("retune routes", () => {
  it("gets_the_suggestion_and_plans_it_once", async () => {
    const { fx, runId } = await flaggedBuild();
    const get = await api().get(`/api/v1/builds/${fx.buildId}/retune`).set(as("viewer"));
    expect(get.status).toBe(200);
    expect(get.body.runId).toBe(runId);
    expect(get.body.suggestion).toMatchObject({ changed: true, series: "E12" });
    expect(get.body.suggestion.design).toBeUndefined();
    expect((await api().post(`/api/v1/builds/${fx.buildId}/retune`).set(as("viewer"))).status).toBe(403);
    const first = await api().post(`/api/v1/builds/${fx.buildId}/retune`).set(as("technician"));
    expect(first.status).toBe(201);
    expect(first.body).toMatchObject({ planned: true, partRef: get.body.suggestion.part, toValue: get.body.suggestion.toSi });
    const again = await api().post(`/api/v1/builds/${fx.buildId}/retune`).set(as("technician")).send({ series: "E12" });
    expect(again.status).toBe(200);
    expect(again.body.id).toBe(first.body.id);
  });
});
