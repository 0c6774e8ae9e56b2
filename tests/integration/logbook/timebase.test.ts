import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { createApiToken } from "@/lib/auth/api-tokens";
import { closeLucia } from "@/lib/auth/lucia";
import type { Role } from "@/lib/auth/permissions";
import { api, captureCsv, COLPITTS_PARTS, sendJson, unique, uploadCapture, waitForRun } from "../api/helpers";
import { createPerson } from "../auth/helpers";

// The scope timebase accuracy of a build, through PATCH /api/v1/builds/{id}, and what it does to a frequency rule:
// a run inside its ±50 ppm window by less than the timebase is "cannot judge", not a pass.
const who = {} as Record<Role, { token: string }>;
let buildId: string;

beforeAll(async () => {
  for (const role of ["viewer", "technician", "engineer"] as const) {
    const person = await createPerson(role, `timebase-${role}`);
    who[role] = { token: (await createApiToken({ userId: person.id, name: "timebase test" })).token };
  }
  const project = await sendJson("post", "/api/v1/projects", who.engineer, { name: unique("Timebase project"), purpose: "timebase test" });
  expect(project.status, project.text).toBe(201);
  const design = await sendJson("post", `/api/v1/projects/${project.body.id}/designs`, who.engineer, {
    name: "Colpitts 409k tight",
    topology: "colpitts",
    parts: COLPITTS_PARTS,
    spec: { targetHz: "409k", toleranceValue: 50, toleranceUnit: "ppm" },
  });
  expect(design.status, design.text).toBe(201);
  const build = await sendJson("post", `/api/v1/designs/${design.body.id}/builds`, who.technician, { label: unique("TB"), kind: "breadboard" });
  expect(build.status, build.text).toBe(201);
  buildId = build.body.id;
}, 60_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("scope timebase accuracy", () => {
  it("is refused when absurd or missing, and for a viewer; stored and cleared for a technician", async () => {
    expect((await sendJson("patch", `/api/v1/builds/${buildId}`, who.viewer, { timebasePpm: 25 })).status).toBe(403);
    const negative = await sendJson("patch", `/api/v1/builds/${buildId}`, who.technician, { timebasePpm: -1 });
    expect(negative.status).toBe(400);
    expect(negative.text).toMatch(/0 ppm or more/);
    expect((await sendJson("patch", `/api/v1/builds/${buildId}`, who.technician, { timebasePpm: 1e9 })).status).toBe(400);
    expect((await sendJson("patch", `/api/v1/builds/${buildId}`, who.technician, {})).status).toBe(400);
    const cleared = await sendJson("patch", `/api/v1/builds/${buildId}`, who.technician, { timebasePpm: null });
    expect([cleared.status, cleared.body.timebasePpm]).toEqual([200, null]);
  });

  it("turns a frequency inside ±50 ppm by less than the timebase into 'cannot judge'", async () => {
    // 409.010 kHz is +24.4 ppm from 409 kHz: inside by 25.6 ppm.
    const first = await uploadCapture(buildId, who.technician, captureCsv(409.01e3, 9101));
    expect(first.status, first.text).toBe(201);
    expect((await waitForRun(first.body.id, who.technician)).verdict).toBe("pass");

    const set = await sendJson("patch", `/api/v1/builds/${buildId}`, who.technician, { timebasePpm: 30 });
    expect([set.status, set.body.timebasePpm]).toEqual([200, 30]);
    expect((await api("get", `/api/v1/builds/${buildId}`, who.viewer)).body.timebasePpm).toBe(30);

    const second = await uploadCapture(buildId, who.technician, captureCsv(409.01e3, 9102));
    expect(second.status, second.text).toBe(201);
    const run = await waitForRun(second.body.id, who.technician);
    expect(run.verdict).toBe("inconclusive");
    const check = (run.checks as { rule: string; outcome: string; message: string }[]).find((c) => c.rule === "frequency");
    expect(check?.outcome).toBe("cannot-judge");
    expect(check?.message).toMatch(/±30 ppm timebase accuracy/);
  }, 180_000);
});
