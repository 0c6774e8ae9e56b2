import { randomBytes } from "node:crypto";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { ACCOUNT_FAILURE_LIMIT } from "@/lib/auth/throttle";
import { meSchema, sessionCreatedSchema } from "@/lib/openapi/schemas/account";
import { api, appUrl, createApiPerson, expectDocumented, expectProblem, roles, sendJson, TEST_PASSWORD, type ApiPerson } from "./helpers";

/** A TEST-NET-2 address (RFC 5737) per call, so the per-address throttle stays per test. */
const someIp = () => `198.51.100.${(randomBytes(1)[0] % 250) + 1}`;

let engineer: ApiPerson;

beforeAll(async () => {
  engineer = await createApiPerson("engineer", "account");
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("GET /api/v1/me", () => {
  for (const role of roles) {
    it(`answers_the_${role}_token_owner_with_id_email_name_role`, async () => {
      const person = role === "engineer" ? engineer : await createApiPerson(role, "me");
      const res = await api("get", "/api/v1/me", person);
      expect(res.status).toBe(200);
      expect(expectDocumented(meSchema, res.body)).toEqual({ id: person.id, email: person.email, name: person.name, role });
    });
  }

  it("answers_401_problems_without_a_token_with_a_made_up_token_and_with_a_non_bearer_scheme", async () => {
    expectProblem(await api("get", "/api/v1/me", null), 401);
    expectProblem(await api("get", "/api/v1/me", { token: `tbk_${"A".repeat(43)}` }), 401);
    expectProblem(await api("get", "/api/v1/me", { token: "not-a-token" }), 401);
    expectProblem(await request(appUrl()).get("/api/v1/me").set("authorization", `Basic ${Buffer.from("a:b").toString("base64")}`), 401);
  });
});

describe("POST /api/v1/session", () => {
  it("signs_in_with_json_and_sets_the_session_cookie_which_then_authenticates", async () => {
    const res = await request(appUrl())
      .post("/api/v1/session")
      .set("x-forwarded-for", someIp())
      .set("content-type", "application/json")
      .send({ email: engineer.email, password: TEST_PASSWORD });
    expect(res.status, res.text).toBe(201);
    const body = expectDocumented(sessionCreatedSchema, res.body);
    expect(body.user.id).toBe(engineer.id);
    const cookie = ([] as string[]).concat(res.headers["set-cookie"] ?? []).find((c) => c.startsWith("tankbook_session="));
    expect(cookie).toMatch(/HttpOnly/i);
    const me = await request(appUrl()).get("/api/v1/me").set("cookie", cookie!.split(";")[0]);
    expect(me.status).toBe(200);
    expect(me.body.id).toBe(engineer.id);

    const out = await request(appUrl()).delete("/api/v1/session").set("cookie", cookie!.split(";")[0]).set("origin", new URL(appUrl()).origin);
    expect(out.status).toBe(204);
    expectProblem(await request(appUrl()).get("/api/v1/me").set("cookie", cookie!.split(";")[0]), 401);
  });

  it("answers_400_for_a_bad_email_401_for_a_wrong_password_and_415_for_a_form_post", async () => {
    const bad = expectProblem(await sendJson("post", "/api/v1/session", null, { email: "not an address", password: "x" }).set("x-forwarded-for", someIp()), 400);
    expect(Object.keys(bad.fields ?? {})).toContain("email");
    expectProblem(await sendJson("post", "/api/v1/session", null, { email: engineer.email, password: "wrong password" }).set("x-forwarded-for", someIp()), 401);
    const form = await request(appUrl()).post("/api/v1/session").set("x-forwarded-for", someIp()).type("form").send({ email: engineer.email, password: TEST_PASSWORD });
    expectProblem(form, 415);
  });

  it(`answers_429_with_retry_after_once_an_account_has_${ACCOUNT_FAILURE_LIMIT}_failures`, async () => {
    const person = await createApiPerson("viewer", "throttled");
    // The lock is per account and address (lib/auth/throttle.ts), so every attempt comes from one address.
    const ip = someIp();
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT; i++) {
      expectProblem(await sendJson("post", "/api/v1/session", null, { email: person.email, password: "wrong password" }).set("x-forwarded-for", ip), 401);
    }
    const blocked = await sendJson("post", "/api/v1/session", null, { email: person.email, password: TEST_PASSWORD }).set("x-forwarded-for", ip);
    expectProblem(blocked, 429);
    expect(Number(blocked.headers["retry-after"])).toBeGreaterThan(0);
  });
});

describe("DELETE /api/v1/session", () => {
  it("answers_401_without_a_session_cookie_even_with_a_token", async () => {
    expectProblem(await api("delete", "/api/v1/session", engineer).set("origin", new URL(appUrl()).origin), 401);
  });
});
