import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { buildSensitivitySchema } from "@/lib/openapi/schemas/sensitivity";
import { api, captureCsv, createFixture, expectDocumented, expectProblem, roles, sendJson, uploadCapture, UNKNOWN_ID, waitForRun, type Fixture } from "./helpers";

// GET /api/v1/builds/{id}/sensitivity against the running stack: real uploads analysed by the worker, a planted
// pushing of −40 ppm/V about 12 V, a part tweak that starts a new build state, and every role reading it. The
// design's spec allows at most 20 ppm/V, so the build-level rule flags runs once three runs measure it.
const F0 = 400_000;
const PLANTED_PPM_PER_V = -40;
const hzAt = (supplyV: number) => F0 * (1 + PLANTED_PPM_PER_V * 1e-6 * (supplyV - 12));

let fx: Fixture;
const firstState: string[] = [];
let afterTweak: string;
const runBodies = new Map<string, Record<string, unknown>>();

beforeAll(async () => {
  fx = await createFixture("sensitivity");
  const spec = await sendJson("patch", `/api/v1/designs/${fx.designId}`, fx.team.engineer, {
    spec: { targetHz: "411k", toleranceValue: 2, toleranceUnit: "percent", maxHarmonicDbc: -30, maxThdPercent: 5, maxPushingPpmPerV: 20 },
    changeNote: "pushing limit",
  });
  expect(spec.status, spec.text).toBe(200);
  let seed = 4200;
  // One at a time: each run's pushing check sees the runs analysed before it.
  for (const supplyV of [9, 11, 13, 15]) {
    const res = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(hzAt(supplyV), seed++), { supplyV: String(supplyV), temperatureC: "25" });
    expect(res.status, res.text).toBe(201);
    firstState.push(res.body.id);
    runBodies.set(res.body.id, await waitForRun(res.body.id, fx.team.viewer));
  }
  const tweak = await sendJson("post", `/api/v1/builds/${fx.buildId}/tweaks`, fx.team.technician, { partRef: "C2", toValue: "5.6n", note: "more feedback" });
  expect(tweak.status, tweak.text).toBe(201);
  const res = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(380e3, seed++), { supplyV: "12", temperatureC: "25" });
  expect(res.status, res.text).toBe(201);
  afterTweak = res.body.id;
  runBodies.set(afterTweak, await waitForRun(afterTweak, fx.team.viewer));
  for (const body of runBodies.values()) expect(body.status).toBe("done");
}, 180_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("GET /api/v1/builds/{buildId}/sensitivity", () => {
  it("recovers the planted pushing from the first build state and keeps the tweaked state apart", async () => {
    const res = await api("get", `/api/v1/builds/${fx.buildId}/sensitivity`, fx.team.viewer);
    expect(res.status, res.text.slice(0, 300)).toBe(200);
    const body = expectDocumented(buildSensitivitySchema, res.body);
    expect(body.groups.map((g) => g.runIds)).toEqual([firstState, [afterTweak]]);
    expect(body.currentGroupIndex).toBe(1);
    const pushing = body.groups[0].pushing;
    expect(pushing.measured).toBe(true);
    if (pushing.measured) {
      expect(pushing.runs).toBe(4);
      expect(pushing.ppm!).toBeGreaterThan(PLANTED_PPM_PER_V - 1);
      expect(pushing.ppm!).toBeLessThan(PLANTED_PPM_PER_V + 1);
      expect(pushing.ppmSigma!).toBeGreaterThan(0);
    }
    // Every run at 25 °C: no tempco, and the reason says so.
    expect(body.groups[0].tempco).toMatchObject({ measured: false, reason: expect.stringMatching(/no spread/) });
    // One run after the tweak: nothing to fit, never a 0.
    expect(body.groups[1].pushing).toMatchObject({ measured: false, reason: expect.stringMatching(/no spread|at least/) });
    // The fixture's C1 and C2 are C0G and L has no tempco: the parts predict about 0 ppm/K.
    expect(body.groups[1].predictedTempco).toMatchObject({ predicted: true, partsWithout: ["L"] });
  });

  it("judges the build-level pushing rule: cannot judge below 3 runs, a flag once it is measured outside 20 ppm/V, cannot judge again in a new state", async () => {
    const pushingCheck = (id: string) => (runBodies.get(id)!.checks as { rule: string; outcome: string; message: string }[]).find((c) => c.rule === "pushing");
    expect(firstState.slice(0, 2).map((id) => pushingCheck(id)?.outcome)).toEqual(["cannot-judge", "cannot-judge"]);
    expect(pushingCheck(firstState[0])?.message).toMatch(/no spread|needs at least 3/);
    for (const id of firstState.slice(2)) {
      expect(pushingCheck(id)).toMatchObject({ outcome: "fail", message: expect.stringMatching(/ppm\/V over [34] runs against ±20 ppm\/V: outside/) });
      expect((runBodies.get(id)!.flags as { rule: string }[]).map((f) => f.rule)).toContain("pushing");
    }
    expect(pushingCheck(afterTweak)?.outcome).toBe("cannot-judge");
    expect((runBodies.get(afterTweak)!.flags as { rule: string }[]).map((f) => f.rule)).not.toContain("pushing");
  });

  it("answers every signed-in role, and refuses anonymous callers and unknown builds", async () => {
    for (const role of roles) {
      const res = await api("get", `/api/v1/builds/${fx.buildId}/sensitivity`, fx.team[role]);
      expect(res.status, `${role}: ${res.text.slice(0, 200)}`).toBe(200);
      expect(res.body.buildId).toBe(fx.buildId);
    }
    expectProblem(await api("get", `/api/v1/builds/${fx.buildId}/sensitivity`, null), 401);
    expectProblem(await api("get", `/api/v1/builds/${UNKNOWN_ID}/sensitivity`, fx.team.viewer), 404);
    expectProblem(await api("get", `/api/v1/builds/not-a-build/sensitivity`, fx.team.viewer), 404);
  });
});
