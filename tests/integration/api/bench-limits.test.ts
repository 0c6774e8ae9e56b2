import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { api, createFixture, expectProblem, sendJson, type Fixture } from "./helpers";

// Issue 12 item 9 / issue 15 "Absurd values are stored": the API refuses what the forms refuse, with the value in
// engineering notation, and stores nothing.

let fx: Fixture;

beforeAll(async () => {
  fx = await createFixture("bench limits");
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("bench limits through /api/v1", () => {
  it("refuses a design with L = 1e30 H and a 1e30 Hz target, naming both fields", async () => {
    const res = await sendJson("post", `/api/v1/projects/${fx.projectId}/designs`, fx.team.engineer, {
      name: "Absurd",
      topology: "tank",
      parts: { L: { value: 1e30 }, C: { value: "1n" } },
      spec: { targetHz: "1e30" },
    });
    const problem = expectProblem(res, 400);
    const fields = JSON.stringify(problem.fields ?? problem);
    expect(fields).toMatch(/1e30 (H|Hz)/);
    expect((await db()("designs").where({ project_id: fx.projectId, name: "Absurd" })).length).toBe(0);
  });

  it("refuses a tweak to C2 = 1e30 F and one that leaves the divider unstartable, changing nothing", async () => {
    const before = (await db()("builds").where({ id: fx.buildId }).first()).as_built;
    const huge = expectProblem(await sendJson("post", `/api/v1/builds/${fx.buildId}/tweaks`, fx.team.technician, { partRef: "C2", toValue: 1e30 }), 400);
    expect(huge.fields?.toValue?.[0]).toBe("The new value of C2 must be from 100 fF to 10 mF; got 1e30 F.");
    // C2 = 10 mF is a plausible part, but with C1 = 2.2 nF β = C1/C2 = 2.2e-7 (REFERENCES.md §1): no stage starts it.
    const lopsided = expectProblem(await sendJson("post", `/api/v1/builds/${fx.buildId}/tweaks`, fx.team.technician, { partRef: "C2", toValue: "10m" }), 400);
    expect(lopsided.fields?.toValue?.[0]).toMatch(/^The feedback fraction β must be from 0\.001 to 1000; got 2\.2e-7/);
    expect((await db()("builds").where({ id: fx.buildId }).first()).as_built).toEqual(before);
    const tweaks = await api("get", `/api/v1/builds/${fx.buildId}/tweaks`, fx.team.viewer);
    expect(tweaks.status).toBe(200);
    expect(tweaks.body.items).toHaveLength(0);
  });

  it("takes a decimal comma in a tweak value", async () => {
    const res = await sendJson("post", `/api/v1/builds/${fx.buildId}/tweaks`, fx.team.technician, { partRef: "C2", toValue: "3,9n" });
    expect(res.status, res.text).toBe(201);
    expect(res.body.toValue).toBe(3.9e-9);
  });
});
