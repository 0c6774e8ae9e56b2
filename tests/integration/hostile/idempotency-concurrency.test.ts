import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { captureCsv, createFixture, expectProblem, uploadCapture, type Fixture } from "../api/helpers";

// Idempotency-Key (draft-ietf-httpapi-idempotency-key-header): concurrent requests with one key end in one run,
// every other answer replays it; a key reused for a different request is refused with 422 (§2.7).

let fx: Fixture;

beforeAll(async () => {
  fx = await createFixture("idem");
}, 120_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

async function runCount(): Promise<number> {
  const [row] = await db()("runs").where({ build_id: fx.buildId }).count<{ count: string }[]>("* as count");
  return Number(row.count);
}

describe("Idempotency-Key under concurrency", () => {
  it("six identical uploads sent at once with one key give one 201 and five replays of that run, not 409s", async () => {
    const csv = captureCsv(411_000, 601);
    const key = `bench-retry-${Date.now()}`;
    const before = await runCount();
    const answers = await Promise.all(
      Array.from({ length: 6 }, () => uploadCapture(fx.buildId, fx.team.technician, csv, { note: "same" }, { idempotencyKey: key }).then((r) => r)),
    );
    const statuses = answers.map((a) => a.status).sort();
    expect(statuses, answers.map((a) => a.text.slice(0, 200)).join("\n")).toEqual([200, 200, 200, 200, 200, 201]);
    const created = answers.find((a) => a.status === 201)!;
    for (const replay of answers.filter((a) => a.status === 200)) {
      expect(replay.headers["idempotent-replayed"]).toBe("true");
      expect(replay.body.id).toBe(created.body.id);
      expect(replay.headers.location).toBe(`/api/v1/runs/${created.body.id}`);
    }
    expect(await runCount()).toBe(before + 1);
  });

  it("a key reused with another file or other details is refused with 422 and stores nothing", async () => {
    const key = `bench-reuse-${Date.now()}`;
    const first = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(411_000, 602), { note: "first" }, { idempotencyKey: key });
    expect(first.status, first.text).toBe(201);
    const before = await runCount();
    const otherFile = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(411_000, 603), { note: "first" }, { idempotencyKey: key });
    const problem = expectProblem(otherFile, 422);
    expect(problem.detail).toContain("Idempotency-Key was already used");
    expect(problem.detail).toContain(first.body.id);
    const otherNote = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(411_000, 602), { note: "second" }, { idempotencyKey: key });
    expectProblem(otherNote, 422);
    // The same request again is still a replay.
    const again = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(411_000, 602), { note: "first" }, { idempotencyKey: key });
    expect(again.status).toBe(200);
    expect(again.body.id).toBe(first.body.id);
    expect(await runCount()).toBe(before);
  });
});
