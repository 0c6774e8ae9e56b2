import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { api, createApiPerson, expectProblem, sendJson } from "../api/helpers";

// The limit the test stack runs with (lib/env.ts default; scripts/bootstrap.mjs does not override it).
const limit = Number(process.env.API_WRITES_PER_MINUTE ?? 600);

async function awayFromMinuteBoundary(): Promise<void> {
  // The count is per calendar minute; starting late in a minute would let the window roll over mid-test.
  const secondsIntoMinute = new Date().getSeconds();
  if (secondsIntoMinute > 45) await new Promise((r) => setTimeout(r, (61 - secondsIntoMinute) * 1000));
}

afterAll(async () => {
  await closeDb();
});

describe("writes through /api/v1 per user and minute", () => {
  it("answers 429 with Retry-After past the limit, counts only that user, and leaves reads alone", async () => {
    const busy = await createApiPerson("engineer", "write-limit");
    const other = await createApiPerson("engineer", "write-limit-other");
    await awayFromMinuteBoundary();

    // Invalid bodies are cheap and still count: the limit is on requests, not on what they achieve.
    const statuses: number[] = [];
    for (let sent = 0; sent < limit; sent += 25) {
      const batch = Array.from({ length: Math.min(25, limit - sent) }, () => sendJson("post", "/api/v1/projects", busy, {}));
      statuses.push(...(await Promise.all(batch)).map((r) => r.status));
    }
    expect(statuses.filter((s) => s === 429)).toHaveLength(0);
    expect(new Set(statuses)).toEqual(new Set([400]));

    const refused = await sendJson("post", "/api/v1/projects", busy, { name: "One too many", purpose: "" });
    const body = expectProblem(refused, 429);
    expect(body.detail).toMatch(/at most \d+ a minute/);
    const retryAfter = Number(refused.headers["retry-after"]);
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    expect(retryAfter).toBeLessThanOrEqual(60);

    // Nothing was created by the refused request.
    const created = await db()("projects").where({ name: "One too many" }).count<{ count: string }[]>("* as count");
    expect(Number(created[0].count)).toBe(0);

    expect((await api("get", "/api/v1/me", busy)).status).toBe(200);
    expect((await sendJson("post", "/api/v1/projects", other, {})).status).toBe(400);
  }, 120_000);
});
