import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { ANONYMOUS_JSON_BODY_LIMIT_BYTES, JSON_BODY_LIMIT_BYTES, JSON_DEPTH_LIMIT, JSON_KEY_LIMIT } from "@/lib/http/json-body";
import { api, createFixture, expectProblem, sendJson, type Fixture } from "../api/helpers";
import { expectHealthy, rawStatus, storedCounts } from "./helpers";

// JSON bodies are capped while they stream and their shape is counted before parsing (OWASP API Security Top 10
// 2023, API4 "Unrestricted Resource Consumption"); a body over the size is 413 (RFC 9110 §15.5.14).

let fx: Fixture;

beforeAll(async () => {
  fx = await createFixture("limits");
}, 120_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

const host = () => new URL(process.env.APP_URL!).host;

describe("JSON body limits", () => {
  it("refuses a 200 MB sign-in body by its Content-Length before reading it, naming the limit", async () => {
    // Only the head is sent: an answer proves the server did not wait for 200 MB.
    const status = await rawStatus(
      `POST /api/v1/session HTTP/1.1\r\nHost: ${host()}\r\nContent-Type: application/json\r\nContent-Length: 200000000\r\n\r\n`,
    );
    expect(status).toBe(413);
    const res = await sendJson("post", "/api/v1/session", null, { email: "a@b.test", password: "x".repeat(ANONYMOUS_JSON_BODY_LIMIT_BYTES) });
    const problem = expectProblem(res, 413);
    expect(problem.detail).toContain(`${ANONYMOUS_JSON_BODY_LIMIT_BYTES} bytes`);
    await expectHealthy();
  });

  it("refuses a chunked sign-in body without Content-Length once it passes the limit", async () => {
    const chunk = "x".repeat(ANONYMOUS_JSON_BODY_LIMIT_BYTES + 10);
    const status = await rawStatus(
      `POST /api/v1/session HTTP/1.1\r\nHost: ${host()}\r\nContent-Type: application/json\r\nTransfer-Encoding: chunked\r\n\r\n` +
        `${chunk.length.toString(16)}\r\n${chunk}\r\n`,
    );
    expect(status).toBe(413);
  });

  it("refuses a signed-in body over the limit with 413 and changes nothing", async () => {
    const before = await storedCounts();
    const res = await sendJson("patch", `/api/v1/projects/${fx.projectId}`, fx.team.engineer, { purpose: "p".repeat(JSON_BODY_LIMIT_BYTES) });
    expect(expectProblem(res, 413).detail).toContain(`${JSON_BODY_LIMIT_BYTES} bytes`);
    expect(await storedCounts()).toEqual(before);
  });

  it(`refuses more than ${JSON_KEY_LIMIT} keys and nesting deeper than ${JSON_DEPTH_LIMIT} with 400 naming the limit`, async () => {
    const manyKeys = `{${Array.from({ length: JSON_KEY_LIMIT + 1 }, (_, i) => `"k${i}":0`).join(",")}}`;
    const keys = await api("patch", `/api/v1/projects/${fx.projectId}`, fx.team.engineer).set("content-type", "application/json").send(manyKeys);
    expect(expectProblem(keys, 400).detail).toContain(`more than ${JSON_KEY_LIMIT} keys`);
    const deep = `${"[".repeat(JSON_DEPTH_LIMIT + 1)}${"]".repeat(JSON_DEPTH_LIMIT + 1)}`;
    const nested = await api("patch", `/api/v1/projects/${fx.projectId}`, fx.team.engineer).set("content-type", "application/json").send(deep);
    expect(expectProblem(nested, 400).detail).toContain(`deeper than ${JSON_DEPTH_LIMIT} levels`);
    const signIn = await api("post", "/api/v1/session", null).set("content-type", "application/json").send(`{${Array.from({ length: 40 }, (_, i) => `"k${i}":0`).join(",")}}`);
    expect(expectProblem(signIn, 400).detail).toMatch(/more than \d+ keys/);
  });
});

describe("text PostgreSQL cannot store", () => {
  // A lone surrogate is no Unicode scalar value and has no UTF-8 form (RFC 3629 §3, RFC 8259 §8.2).
  const loneSurrogate = '"bench \\udc00 note"';

  it("refuses a lone surrogate in a project name, a tweak note and a slot file name with 400 naming the field, storing nothing", async () => {
    const before = await storedCounts();
    const project = await api("post", "/api/v1/projects", fx.team.engineer).set("content-type", "application/json").send(`{"name":${loneSurrogate},"purpose":"x"}`);
    const p = expectProblem(project, 400);
    expect(p.fields).toHaveProperty("name");
    expect(p.detail).toContain("lone UTF-16 surrogate");
    const tweak = await api("post", `/api/v1/builds/${fx.buildId}/tweaks`, fx.team.technician)
      .set("content-type", "application/json")
      .send(`{"changes":[],"note":${loneSurrogate}}`);
    expect(expectProblem(tweak, 400).fields).toHaveProperty("note");
    const slot = await api("post", "/api/v1/uploads", fx.team.technician)
      .set("content-type", "application/json")
      .send(`{"buildId":"${fx.buildId}","filename":"a\\ud800.csv","sizeBytes":10}`);
    expect(expectProblem(slot, 400).fields).toHaveProperty("filename");
    expect(await storedCounts()).toEqual(before);
  });

  it("refuses a NUL in a multipart filename* with 400 naming the file field", async () => {
    const boundary = "----nulname";
    const body =
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename*=UTF-8''cap%00ture.csv\r\nContent-Type: text/csv\r\n\r\n` +
      `time,ch1\n0,1\n1e-8,0\n\r\n--${boundary}--\r\n`;
    const before = await storedCounts();
    const res = await api("post", `/api/v1/builds/${fx.buildId}/runs`, fx.team.technician).set("content-type", `multipart/form-data; boundary=${boundary}`).send(body);
    const problem = expectProblem(res, 400);
    expect(problem.detail).toContain("NUL");
    expect(problem.fields).toHaveProperty("file");
    expect(await storedCounts()).toEqual(before);
  });
});

describe("times out of PostgreSQL's range", () => {
  it("answers 400 for from=-271821-04-20 on the runs list and on runs.csv before any CSV is sent", async () => {
    const list = await api("get", `/api/v1/builds/${fx.buildId}/runs?from=-271821-04-20`, fx.team.viewer);
    expect(expectProblem(list, 400).detail).toContain("between 1900-01-01 and 9999-12-31");
    const csv = await api("get", `/api/v1/builds/${fx.buildId}/runs.csv?to=%2B275760-09-13`, fx.team.viewer);
    expectProblem(csv, 400);
    const fine = await api("get", `/api/v1/builds/${fx.buildId}/runs.csv?from=2026-01-01`, fx.team.viewer);
    expect(fine.status).toBe(200);
    expect(fine.headers["content-type"]).toMatch(/^text\/csv/);
  });
});

describe("design PATCH that changes nothing", () => {
  async function revisionCount(): Promise<number> {
    const [row] = await db()("design_revisions").where({ design_id: fx.designId }).count<{ count: string }[]>("* as count");
    return Number(row.count);
  }

  it("answers 400 for {}, a blank note alone, an unknown key, an unknown topology and another topology, and writes no revision", async () => {
    const before = await revisionCount();
    expect(expectProblem(await sendJson("patch", `/api/v1/designs/${fx.designId}`, fx.team.engineer, {}), 400).detail).toMatch(/^Nothing to change/);
    expect(expectProblem(await sendJson("patch", `/api/v1/designs/${fx.designId}`, fx.team.engineer, { changeNote: "  " }), 400).detail).toMatch(/^Nothing to change/);
    expect(expectProblem(await sendJson("patch", `/api/v1/designs/${fx.designId}`, fx.team.engineer, { colour: "red" }), 400).fields).toHaveProperty("colour");
    expect(expectProblem(await sendJson("patch", `/api/v1/designs/${fx.designId}`, fx.team.engineer, { topology: "flux-capacitor" }), 400).detail).toMatch(/^Unknown topology/);
    expect(expectProblem(await sendJson("patch", `/api/v1/designs/${fx.designId}`, fx.team.engineer, { topology: "hartley" }), 400).detail).toContain("fixed");
    expect(await revisionCount()).toBe(before);
    // A real change still makes a revision.
    const renamed = await sendJson("patch", `/api/v1/designs/${fx.designId}`, fx.team.engineer, { name: "Colpitts 411k, renamed" });
    expect(renamed.status, renamed.text).toBe(200);
    expect(await revisionCount()).toBe(before + 1);
  });
});
