import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { env } from "@/lib/env";
import { api, createApiPerson, expectProblem, sendJson, unique, type ApiPerson } from "./helpers";

let busy: ApiPerson;
let calm: ApiPerson;

/**
 * Spends the account's write budget for this minute and the next (so the test holds across a minute boundary),
 * straight in the table lib/http/api-handler.ts counts in, instead of sending 600 requests.
 */
async function spendWriteBudget(userId: string): Promise<void> {
  const limit = env().API_WRITES_PER_MINUTE;
  const minute = Math.floor(Date.now() / 60_000) * 60_000;
  for (const start of [minute, minute + 60_000]) {
    await db()("api_write_counts").insert({ user_id: userId, window_start: new Date(start), count: limit }).onConflict(["user_id", "window_start"]).merge();
  }
}

beforeAll(async () => {
  [busy, calm] = await Promise.all([createApiPerson("engineer", "busy"), createApiPerson("engineer", "calm")]);
  await spendWriteBudget(busy.id);
});

afterAll(async () => {
  await db()("api_write_counts").whereIn("user_id", [busy.id, calm.id]).delete();
  await closeDb();
  await closeLucia();
});

describe("the API write limit", () => {
  it("answers_429_with_retry_after_past_API_WRITES_PER_MINUTE_while_reads_and_other_accounts_go_on", async () => {
    const refused = await sendJson("post", "/api/v1/projects", busy, { name: unique("One too many") });
    const problem = expectProblem(refused, 429);
    expect(problem.detail).toMatch(new RegExp(`${env().API_WRITES_PER_MINUTE}`));
    const retryAfter = Number(refused.headers["retry-after"]);
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    expect(retryAfter).toBeLessThanOrEqual(120);
    expect((await api("get", "/api/v1/projects", busy)).status).toBe(200);
    expect((await sendJson("post", "/api/v1/projects", calm, { name: unique("Calm") })).status).toBe(201);
  });
});
