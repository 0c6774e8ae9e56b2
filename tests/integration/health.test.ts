import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { appUrl, startPostgres, stopPostgres } from "../helpers/stack";

describe("GET /api/health", () => {
  afterAll(() => startPostgres());

  it("reports every part ok on the running app", async () => {
    const res = await request(appUrl()).get("/api/health");
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/application\/json/);
    expect(res.body).toEqual({ ok: true, db: "ok", storage: "ok", mail: "ok" });
  });

  it("reports db not ok with 503 while PostgreSQL is stopped, and recovers without a restart of the app", async () => {
    stopPostgres();
    try {
      const down = await request(appUrl()).get("/api/health");
      expect(down.status).toBe(503);
      expect(down.body.ok).toBe(false);
      expect(down.body.db).toMatch(/PostgreSQL is not answering/);
      expect(down.body.storage).toBe("ok");
      expect(down.body.mail).toBe("ok");
    } finally {
      startPostgres();
    }
    let status = 0;
    for (let i = 0; i < 40 && status !== 200; i++) {
      status = (await request(appUrl()).get("/api/health")).status;
      if (status !== 200) await new Promise((r) => setTimeout(r, 250));
    }
    expect(status).toBe(200);
  });
});
