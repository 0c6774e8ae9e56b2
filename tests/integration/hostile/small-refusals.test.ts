import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { FILENAME_MAX_CHARS } from "@/lib/logbook/multipart";
import { appUrl, captureCsv, createFixture, expectProblem, sendJson, TEST_PASSWORD, unique, uploadCapture, type Fixture } from "../api/helpers";
import { getPage, signedInCookie } from "../auth/helpers";
import { storedCounts } from "./helpers";

let fx: Fixture;

beforeAll(async () => {
  fx = await createFixture("small");
}, 120_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("Authorization scheme", () => {
  it("accepts bearer in any case (RFC 9110 §11.1: the scheme name is case-insensitive) and still refuses other schemes", async () => {
    for (const scheme of ["bearer", "BEARER", "Bearer", "bEaReR"]) {
      const res = await request(appUrl()).get("/api/v1/me").set("authorization", `${scheme} ${fx.team.viewer.token}`);
      expect(res.status, scheme).toBe(200);
      expect(res.body.id).toBe(fx.team.viewer.id);
    }
    expectProblem(await request(appUrl()).get("/api/v1/me").set("authorization", `Token ${fx.team.viewer.token}`), 401);
  });
});

describe("capture file names and sizes", () => {
  it(`refuses a multipart file name over ${FILENAME_MAX_CHARS} characters with a message saying so, storing nothing`, async () => {
    const before = await storedCounts();
    const name = `${"n".repeat(FILENAME_MAX_CHARS)}.csv`;
    const res = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(411_000, 701), {}, { filename: name });
    const problem = expectProblem(res, 400);
    expect(problem.detail).toBe(`The file name is ${name.length} characters long; ${FILENAME_MAX_CHARS} at most. Rename the file and upload it again.`);
    expect(await storedCounts()).toEqual(before);
    const fine = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(411_000, 702), {}, { filename: `${"n".repeat(FILENAME_MAX_CHARS - 4)}.csv` });
    expect(fine.status, fine.text).toBe(201);
  });

  it("refuses a 500,000,001-byte file with a message that says by how much it is over", async () => {
    const res = await sendJson("post", "/api/v1/uploads", fx.team.technician, { buildId: fx.buildId, filename: "big.csv", sizeBytes: 500_000_001 });
    const problem = expectProblem(res, 413);
    expect(problem.detail).toBe("The file is 500,000,001 bytes, 1 byte over the capture limit of 500 MB (500,000,000 bytes).");
  });
});

describe("names with bidi controls", () => {
  it("are isolated in <bdi> on the dashboard and in build tables, so they cannot reverse the text around them (Unicode UAX #9)", async () => {
    const label = `${unique("RLO")} \u202Eabc`;
    const build = await sendJson("post", `/api/v1/designs/${fx.designId}/builds`, fx.team.technician, { label, kind: "breadboard" });
    expect(build.status, build.text).toBe(201);
    const cookie = await signedInCookie({ email: fx.team.technician.email, password: TEST_PASSWORD });
    const dashboard = await getPage("/dashboard", cookie);
    expect(dashboard.status).toBe(200);
    expect(dashboard.text).toContain(`<bdi>${label}</bdi>`);
    const project = await getPage(`/projects/${fx.projectId}`, cookie);
    expect(project.text).toContain(`<bdi>${label}</bdi>`);
  });
});
